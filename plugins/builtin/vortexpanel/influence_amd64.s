//go:build !purego

#include "textflag.h"

// The influence row of the vortex-panel build, four panels at a time with
// AVX2 and FMA, or eight with AVX-512 (see influence_amd64.go and fillRow
// for the formulas). The logarithm and the angle follow the algorithms and
// coefficients of Go's math.Log (FreeBSD's e_log.c) and math.Atan
// (Cephes), with the quadrants of atan2 resolved by masks instead of
// branches; logAVX2 and atan2AVX2 run the same code over slices for the
// tests against the math package. Both widths expand from one text: the
// macros after the constants take the registers as parameters.

#define absmask kc<>+0(SB)
#define signmask kc<>+32(SB)
#define mantmask kc<>+64(SB)
#define one kc<>+96(SB)
#define two kc<>+128(SB)
#define half kc<>+160(SB)
#define two52 kc<>+192(SB)
#define bias kc<>+224(SB)
#define sqrt2 kc<>+256(SB)
#define minnorm kc<>+288(SB)
#define maxf kc<>+320(SB)
#define nan kc<>+352(SB)
#define ln2hi kc<>+384(SB)
#define ln2lo kc<>+416(SB)
#define L1 kc<>+448(SB)
#define L2 kc<>+480(SB)
#define L3 kc<>+512(SB)
#define L4 kc<>+544(SB)
#define L5 kc<>+576(SB)
#define L6 kc<>+608(SB)
#define L7 kc<>+640(SB)
#define P0 kc<>+672(SB)
#define P1 kc<>+704(SB)
#define P2 kc<>+736(SB)
#define P3 kc<>+768(SB)
#define P4 kc<>+800(SB)
#define Q0 kc<>+832(SB)
#define Q1 kc<>+864(SB)
#define Q2 kc<>+896(SB)
#define Q3 kc<>+928(SB)
#define Q4 kc<>+960(SB)
#define c066 kc<>+992(SB)
#define pio4 kc<>+1024(SB)
#define halfmb kc<>+1056(SB)
#define pio2 kc<>+1088(SB)
#define morebits kc<>+1120(SB)
#define pi kc<>+1152(SB)
#define inv2pi kc<>+1184(SB)
#define tan3pio8 kc<>+1216(SB)

DATA kc<>+0(SB)/8, $0x7FFFFFFFFFFFFFFF
DATA kc<>+8(SB)/8, $0x7FFFFFFFFFFFFFFF
DATA kc<>+16(SB)/8, $0x7FFFFFFFFFFFFFFF
DATA kc<>+24(SB)/8, $0x7FFFFFFFFFFFFFFF
DATA kc<>+32(SB)/8, $0x8000000000000000
DATA kc<>+40(SB)/8, $0x8000000000000000
DATA kc<>+48(SB)/8, $0x8000000000000000
DATA kc<>+56(SB)/8, $0x8000000000000000
DATA kc<>+64(SB)/8, $0x000FFFFFFFFFFFFF
DATA kc<>+72(SB)/8, $0x000FFFFFFFFFFFFF
DATA kc<>+80(SB)/8, $0x000FFFFFFFFFFFFF
DATA kc<>+88(SB)/8, $0x000FFFFFFFFFFFFF
DATA kc<>+96(SB)/8, $0x3FF0000000000000
DATA kc<>+104(SB)/8, $0x3FF0000000000000
DATA kc<>+112(SB)/8, $0x3FF0000000000000
DATA kc<>+120(SB)/8, $0x3FF0000000000000
DATA kc<>+128(SB)/8, $0x4000000000000000
DATA kc<>+136(SB)/8, $0x4000000000000000
DATA kc<>+144(SB)/8, $0x4000000000000000
DATA kc<>+152(SB)/8, $0x4000000000000000
DATA kc<>+160(SB)/8, $0x3FE0000000000000
DATA kc<>+168(SB)/8, $0x3FE0000000000000
DATA kc<>+176(SB)/8, $0x3FE0000000000000
DATA kc<>+184(SB)/8, $0x3FE0000000000000
DATA kc<>+192(SB)/8, $0x4330000000000000
DATA kc<>+200(SB)/8, $0x4330000000000000
DATA kc<>+208(SB)/8, $0x4330000000000000
DATA kc<>+216(SB)/8, $0x4330000000000000
DATA kc<>+224(SB)/8, $0x43300000000003FF
DATA kc<>+232(SB)/8, $0x43300000000003FF
DATA kc<>+240(SB)/8, $0x43300000000003FF
DATA kc<>+248(SB)/8, $0x43300000000003FF
DATA kc<>+256(SB)/8, $0x3FF6A09E667F3BCD
DATA kc<>+264(SB)/8, $0x3FF6A09E667F3BCD
DATA kc<>+272(SB)/8, $0x3FF6A09E667F3BCD
DATA kc<>+280(SB)/8, $0x3FF6A09E667F3BCD
DATA kc<>+288(SB)/8, $0x0010000000000000
DATA kc<>+296(SB)/8, $0x0010000000000000
DATA kc<>+304(SB)/8, $0x0010000000000000
DATA kc<>+312(SB)/8, $0x0010000000000000
DATA kc<>+320(SB)/8, $0x7FEFFFFFFFFFFFFF
DATA kc<>+328(SB)/8, $0x7FEFFFFFFFFFFFFF
DATA kc<>+336(SB)/8, $0x7FEFFFFFFFFFFFFF
DATA kc<>+344(SB)/8, $0x7FEFFFFFFFFFFFFF
DATA kc<>+352(SB)/8, $0x7FF8000000000001
DATA kc<>+360(SB)/8, $0x7FF8000000000001
DATA kc<>+368(SB)/8, $0x7FF8000000000001
DATA kc<>+376(SB)/8, $0x7FF8000000000001
DATA kc<>+384(SB)/8, $0x3FE62E42FEE00000
DATA kc<>+392(SB)/8, $0x3FE62E42FEE00000
DATA kc<>+400(SB)/8, $0x3FE62E42FEE00000
DATA kc<>+408(SB)/8, $0x3FE62E42FEE00000
DATA kc<>+416(SB)/8, $0x3DEA39EF35793C76
DATA kc<>+424(SB)/8, $0x3DEA39EF35793C76
DATA kc<>+432(SB)/8, $0x3DEA39EF35793C76
DATA kc<>+440(SB)/8, $0x3DEA39EF35793C76
DATA kc<>+448(SB)/8, $0x3FE5555555555593
DATA kc<>+456(SB)/8, $0x3FE5555555555593
DATA kc<>+464(SB)/8, $0x3FE5555555555593
DATA kc<>+472(SB)/8, $0x3FE5555555555593
DATA kc<>+480(SB)/8, $0x3FD999999997FA04
DATA kc<>+488(SB)/8, $0x3FD999999997FA04
DATA kc<>+496(SB)/8, $0x3FD999999997FA04
DATA kc<>+504(SB)/8, $0x3FD999999997FA04
DATA kc<>+512(SB)/8, $0x3FD2492494229359
DATA kc<>+520(SB)/8, $0x3FD2492494229359
DATA kc<>+528(SB)/8, $0x3FD2492494229359
DATA kc<>+536(SB)/8, $0x3FD2492494229359
DATA kc<>+544(SB)/8, $0x3FCC71C51D8E78AF
DATA kc<>+552(SB)/8, $0x3FCC71C51D8E78AF
DATA kc<>+560(SB)/8, $0x3FCC71C51D8E78AF
DATA kc<>+568(SB)/8, $0x3FCC71C51D8E78AF
DATA kc<>+576(SB)/8, $0x3FC7466496CB03DE
DATA kc<>+584(SB)/8, $0x3FC7466496CB03DE
DATA kc<>+592(SB)/8, $0x3FC7466496CB03DE
DATA kc<>+600(SB)/8, $0x3FC7466496CB03DE
DATA kc<>+608(SB)/8, $0x3FC39A09D078C69F
DATA kc<>+616(SB)/8, $0x3FC39A09D078C69F
DATA kc<>+624(SB)/8, $0x3FC39A09D078C69F
DATA kc<>+632(SB)/8, $0x3FC39A09D078C69F
DATA kc<>+640(SB)/8, $0x3FC2F112DF3E5244
DATA kc<>+648(SB)/8, $0x3FC2F112DF3E5244
DATA kc<>+656(SB)/8, $0x3FC2F112DF3E5244
DATA kc<>+664(SB)/8, $0x3FC2F112DF3E5244
DATA kc<>+672(SB)/8, $0xBFEC007FA1F72594
DATA kc<>+680(SB)/8, $0xBFEC007FA1F72594
DATA kc<>+688(SB)/8, $0xBFEC007FA1F72594
DATA kc<>+696(SB)/8, $0xBFEC007FA1F72594
DATA kc<>+704(SB)/8, $0xC03028545B6B807A
DATA kc<>+712(SB)/8, $0xC03028545B6B807A
DATA kc<>+720(SB)/8, $0xC03028545B6B807A
DATA kc<>+728(SB)/8, $0xC03028545B6B807A
DATA kc<>+736(SB)/8, $0xC052C08C36880273
DATA kc<>+744(SB)/8, $0xC052C08C36880273
DATA kc<>+752(SB)/8, $0xC052C08C36880273
DATA kc<>+760(SB)/8, $0xC052C08C36880273
DATA kc<>+768(SB)/8, $0xC05EB8BF2D05BA25
DATA kc<>+776(SB)/8, $0xC05EB8BF2D05BA25
DATA kc<>+784(SB)/8, $0xC05EB8BF2D05BA25
DATA kc<>+792(SB)/8, $0xC05EB8BF2D05BA25
DATA kc<>+800(SB)/8, $0xC0503669FD28EC8E
DATA kc<>+808(SB)/8, $0xC0503669FD28EC8E
DATA kc<>+816(SB)/8, $0xC0503669FD28EC8E
DATA kc<>+824(SB)/8, $0xC0503669FD28EC8E
DATA kc<>+832(SB)/8, $0x4038DBC45B14603C
DATA kc<>+840(SB)/8, $0x4038DBC45B14603C
DATA kc<>+848(SB)/8, $0x4038DBC45B14603C
DATA kc<>+856(SB)/8, $0x4038DBC45B14603C
DATA kc<>+864(SB)/8, $0x4064A0DD43B8FA25
DATA kc<>+872(SB)/8, $0x4064A0DD43B8FA25
DATA kc<>+880(SB)/8, $0x4064A0DD43B8FA25
DATA kc<>+888(SB)/8, $0x4064A0DD43B8FA25
DATA kc<>+896(SB)/8, $0x407B0E18D2E2BE3B
DATA kc<>+904(SB)/8, $0x407B0E18D2E2BE3B
DATA kc<>+912(SB)/8, $0x407B0E18D2E2BE3B
DATA kc<>+920(SB)/8, $0x407B0E18D2E2BE3B
DATA kc<>+928(SB)/8, $0x407E563F13B049EA
DATA kc<>+936(SB)/8, $0x407E563F13B049EA
DATA kc<>+944(SB)/8, $0x407E563F13B049EA
DATA kc<>+952(SB)/8, $0x407E563F13B049EA
DATA kc<>+960(SB)/8, $0x4068519EFBBD62EC
DATA kc<>+968(SB)/8, $0x4068519EFBBD62EC
DATA kc<>+976(SB)/8, $0x4068519EFBBD62EC
DATA kc<>+984(SB)/8, $0x4068519EFBBD62EC
DATA kc<>+992(SB)/8, $0x3FE51EB851EB851F
DATA kc<>+1000(SB)/8, $0x3FE51EB851EB851F
DATA kc<>+1008(SB)/8, $0x3FE51EB851EB851F
DATA kc<>+1016(SB)/8, $0x3FE51EB851EB851F
DATA kc<>+1024(SB)/8, $0x3FE921FB54442D18
DATA kc<>+1032(SB)/8, $0x3FE921FB54442D18
DATA kc<>+1040(SB)/8, $0x3FE921FB54442D18
DATA kc<>+1048(SB)/8, $0x3FE921FB54442D18
DATA kc<>+1056(SB)/8, $0x3C81A62633145C07
DATA kc<>+1064(SB)/8, $0x3C81A62633145C07
DATA kc<>+1072(SB)/8, $0x3C81A62633145C07
DATA kc<>+1080(SB)/8, $0x3C81A62633145C07
DATA kc<>+1088(SB)/8, $0x3FF921FB54442D18
DATA kc<>+1096(SB)/8, $0x3FF921FB54442D18
DATA kc<>+1104(SB)/8, $0x3FF921FB54442D18
DATA kc<>+1112(SB)/8, $0x3FF921FB54442D18
DATA kc<>+1120(SB)/8, $0x3C91A62633145C07
DATA kc<>+1128(SB)/8, $0x3C91A62633145C07
DATA kc<>+1136(SB)/8, $0x3C91A62633145C07
DATA kc<>+1144(SB)/8, $0x3C91A62633145C07
DATA kc<>+1152(SB)/8, $0x400921FB54442D18
DATA kc<>+1160(SB)/8, $0x400921FB54442D18
DATA kc<>+1168(SB)/8, $0x400921FB54442D18
DATA kc<>+1176(SB)/8, $0x400921FB54442D18
DATA kc<>+1184(SB)/8, $0x3FC45F306DC9C883
DATA kc<>+1192(SB)/8, $0x3FC45F306DC9C883
DATA kc<>+1200(SB)/8, $0x3FC45F306DC9C883
DATA kc<>+1208(SB)/8, $0x3FC45F306DC9C883
DATA kc<>+1216(SB)/8, $0x4003504F333F9DE6
DATA kc<>+1224(SB)/8, $0x4003504F333F9DE6
DATA kc<>+1232(SB)/8, $0x4003504F333F9DE6
DATA kc<>+1240(SB)/8, $0x4003504F333F9DE6
GLOBL kc<>(SB), RODATA|NOPTR, $1248

// The two row kernels, four lanes with AVX2 and eight with AVX-512, do the
// same operations in the same order, and so do their logarithms and angles.
// The macros below hold the text they share once, with the registers as
// parameters and, where the two write an operation differently, the
// instruction: mulc, addc, subc and andc multiply, add, subtract or and a
// constant from kc, their first operand (VMULPD, VADDPD, VSUBPD and VANDPD
// on the whole vector; VMULPD.BCST, VADDPD.BCST, VSUBPD.BCST and
// VPANDQ.BCST on its first lane broadcast), and loadc loads one into a
// register (VMOVUPD, VBROADCASTSD). lg is log₂ of the lanes: 2 or 3.

// LOGCORE sets lnx = ln(m·2^k) for m in [√½, √2) and k an integer held as
// a float64; m becomes f = m − 1, and s, s2, s4, r, r2, h, t and u are
// scratch. The steps of
// math.Log after its reduction, unfused: s = f/(2 + f); R = s²(L1 +
// s⁴(L3 + s⁴(L5 + s⁴L7))) + s⁴(L2 + s⁴(L4 + s⁴L6)), hfsq = f²/2; ln x =
// k·Ln2Hi − ((hfsq − (s(hfsq + R) + k·Ln2Lo)) − f).
#define LOGCORE(k, m, s, s2, s4, r, r2, h, t, u, lnx, mulc, addc, subc) \
	subc   one, m, m \
	addc   two, m, s \
	VDIVPD s, m, s \
	VMULPD s, s, s2 \
	VMULPD s2, s2, s4 \
	mulc   L7, s4, r \
	addc   L5, r, r \
	VMULPD s4, r, r \
	addc   L3, r, r \
	VMULPD s4, r, r \
	addc   L1, r, r \
	VMULPD r, s2, r \
	mulc   L6, s4, r2 \
	addc   L4, r2, r2 \
	VMULPD s4, r2, r2 \
	addc   L2, r2, r2 \
	VMULPD r2, s4, r2 \
	VADDPD r2, r, r \
	mulc   half, m, h \
	VMULPD m, h, h \
	VADDPD h, r, t \
	VMULPD t, s, t \
	mulc   ln2lo, k, u \
	VADDPD u, t, t \
	VSUBPD t, h, u \
	VSUBPD m, u, u \
	mulc   ln2hi, k, lnx \
	VSUBPD u, lnx, lnx

// BLENDV and BLENDK set d = a in the lanes of the mask m and b in the
// others: m a vector whose lanes' sign bits mark them (VBLENDVPD), or a
// mask register (VBLENDMPD).
#define BLENDV(m, a, b, d) VBLENDVPD m, a, b, d
#define BLENDK(m, a, b, d) VBLENDMPD a, b, m, d

// ATANREDUCE sets a = |y|, b = |x|, the masks hi of a > b·tan 3π/8 and lo
// of a ≤ 0.66·b (see ATAN24), and the numerator and denominator of the
// reduced argument: a and b where lo, b and a where hi, a − b and a + b
// between; w is scratch. BLEND is BLENDV or BLENDK.
#define ATANREDUCE(y, x, a, b, w, hi, lo, num, den, andc, mulc, BLEND) \
	andc   absmask, y, a \
	andc   absmask, x, b \
	mulc   tan3pio8, b, w \
	VCMPPD $0x1E, w, a, hi \
	mulc   c066, b, w \
	VCMPPD $0x12, w, a, lo \
	VSUBPD b, a, num \
	VADDPD b, a, den \
	BLEND(lo, a, num, num) \
	BLEND(lo, b, den, den) \
	BLEND(hi, b, num, num) \
	BLEND(hi, a, den, den)

// ATANCORE sets t to the reduced argument t/d, p = xatan(t) = t + t·(z·P(z)/
// Q(z)), z = t² (Go's math.Atan: Cephes), and the angle of the other two
// ranges: mid = π/4 + p + Morebits/2, far = π/2 − p + Morebits; z and q are
// scratch.
#define ATANCORE(t, d, z, p, q, mid, far, mulc, addc, loadc) \
	VDIVPD d, t, t \
	VMULPD t, t, z \
	mulc   P0, z, p \
	addc   P1, p, p \
	VMULPD z, p, p \
	addc   P2, p, p \
	VMULPD z, p, p \
	addc   P3, p, p \
	VMULPD z, p, p \
	addc   P4, p, p \
	addc   Q0, z, q \
	VMULPD z, q, q \
	addc   Q1, q, q \
	VMULPD z, q, q \
	addc   Q2, q, q \
	VMULPD z, q, q \
	addc   Q3, q, q \
	VMULPD z, q, q \
	addc   Q4, q, q \
	VMULPD p, z, p \
	VDIVPD q, p, p \
	VMULPD p, t, p \
	VADDPD t, p, p \
	addc   pio4, p, mid \
	addc   halfmb, mid, mid \
	loadc  pio2, far \
	VSUBPD p, far, far \
	addc   morebits, far, far

// LOG4 sets Y12 = ln Y0 for Y0 in [minnorm, maxf], and Y1 to the mask of
// those lanes; it uses Y0–Y12. The steps and their order are those of Go's
// math.Log on amd64 (log_amd64.s), unfused, so the results are the same:
// x = m·2^e with m in [√½, √2) and k = e, then LOGCORE.
#define LOG4 \
	VCMPPD    $0x1D, minnorm, Y0, Y1 \
	VCMPPD    $0x12, maxf, Y0, Y2 \
	VANDPD    Y2, Y1, Y1 \
	VPSRLQ    $52, Y0, Y2 \
	VPOR      two52, Y2, Y2 \
	VSUBPD    bias, Y2, Y2 \
	VANDPD    mantmask, Y0, Y3 \
	VORPD     one, Y3, Y3 \
	VCMPPD    $0x1D, sqrt2, Y3, Y4 \
	VMULPD    half, Y3, Y5 \
	VBLENDVPD Y4, Y5, Y3, Y3 \
	VANDPD    one, Y4, Y4 \
	VADDPD    Y4, Y2, Y2 \
	LOGCORE(Y2, Y3, Y4, Y5, Y6, Y7, Y8, Y9, Y10, Y11, Y12, VMULPD, VADDPD, VSUBPD)

// ATAN24 sets Y10 = atan2(Y0, Y1); it uses Y0–Y13. The steps and their
// order are those of angle (angle.go), unfused, with the branches as masks,
// so the results are the same: with a = |y|, b = |x|, atan(a/b) =
// xatan(a/b) for a ≤ 0.66·b, π/4 + xatan((a − b)/(a + b)) + Morebits/2 up
// to a = b·tan 3π/8, π/2 − xatan(b/a) + Morebits beyond (ATANREDUCE,
// ATANCORE); then
// π − atan if x is negative, and the sign of y. One division reduces the
// argument where math.Atan2 takes two (y/x, then the reduction of the
// rounded quotient); the results are within a unit in the last place of
// math.Atan2. Both arguments zero, both infinite, or a NaN give NaN.
#define ATAN24 \
	ATANREDUCE(Y0, Y1, Y2, Y3, Y4, Y5, Y6, Y7, Y8, VANDPD, VMULPD, BLENDV) \
	ATANCORE(Y7, Y8, Y9, Y10, Y11, Y12, Y13, VMULPD, VADDPD, VMOVUPD) \
	BLENDV(Y5, Y13, Y12, Y12) \
	BLENDV(Y6, Y10, Y12, Y10) \
	VMOVUPD pi, Y12 \
	VSUBPD  Y10, Y12, Y12 \
	BLENDV(Y1, Y12, Y10, Y10) \
	VANDPD  signmask, Y0, Y12 \
	VORPD   Y12, Y10, Y10

// LOG8 sets Z12 = ln Z0 for Z0 in [minnorm, maxf] (other lanes are not
// marked: the row's ratios are in the domain); it uses Z0–Z12 and K3. The
// operations of LOG4 on eight lanes, in its order, with the constants
// broadcast from their first lane and the reduction's branch as a mask.
#define LOG8 \
	VPSRLQ      $52, Z0, Z2 \
	VPORQ.BCST  two52, Z2, Z2 \
	VSUBPD.BCST bias, Z2, Z2 \
	VPANDQ.BCST mantmask, Z0, Z3 \
	VPORQ.BCST  one, Z3, Z3 \
	VCMPPD.BCST $0x1D, sqrt2, Z3, K3 \
	VMULPD.BCST half, Z3, Z5 \
	VBLENDMPD   Z5, Z3, K3, Z3 \
	VADDPD.BCST one, Z2, K3, Z2 \
	LOGCORE(Z2, Z3, Z4, Z5, Z6, Z7, Z8, Z9, Z10, Z11, Z12, VMULPD.BCST, VADDPD.BCST, VSUBPD.BCST)

// ATAN28 sets Z10 = atan2(Z0, Z1); it uses Z0–Z13 and K1–K3. The
// operations of ATAN24 on eight lanes, in its order, with the branches as
// masks.
#define ATAN28 \
	ATANREDUCE(Z0, Z1, Z2, Z3, Z4, K1, K2, Z7, Z8, VPANDQ.BCST, VMULPD.BCST, BLENDK) \
	ATANCORE(Z7, Z8, Z9, Z10, Z11, Z12, Z13, VMULPD.BCST, VADDPD.BCST, VBROADCASTSD) \
	BLENDK(K1, Z13, Z12, Z12) \
	BLENDK(K2, Z10, Z12, Z10) \
	VBROADCASTSD  pi, Z12 \
	VSUBPD        Z10, Z12, Z12 \
	VPTESTMQ.BCST signmask, Z1, K3 \
	BLENDK(K3, Z12, Z10, Z10) \
	VPANDQ.BCST   signmask, Z0, Z12 \
	VPORQ         Z12, Z10, Z10

// func logAVX2(dst, x *float64, n int) (special int)
// n is a positive multiple of 4. Lanes outside the domain are NaN and counted.
TEXT ·logAVX2(SB), NOSPLIT, $0-32
	MOVQ    dst+0(FP), DI
	MOVQ    x+8(FP), SI
	MOVQ    n+16(FP), CX
	SHRQ    $2, CX
	XORQ    R9, R9
	VMOVUPD nan, Y15

logloop:
	VMOVUPD   (SI), Y0
	LOG4
	VBLENDVPD Y1, Y12, Y15, Y12
	VMOVUPD   Y12, (DI)
	VMOVMSKPD Y1, AX
	XORQ      $15, AX
	POPCNTQ   AX, AX
	ADDQ      AX, R9
	ADDQ      $32, SI
	ADDQ      $32, DI
	DECQ      CX
	JNZ       logloop

	VZEROUPPER
	MOVQ R9, special+24(FP)
	RET

// func atan2AVX2(dst, y, x *float64, n int) (special int)
// n is a positive multiple of 4. NaN results are counted.
TEXT ·atan2AVX2(SB), NOSPLIT, $0-40
	MOVQ    dst+0(FP), DI
	MOVQ    y+8(FP), SI
	MOVQ    x+16(FP), DX
	MOVQ    n+24(FP), CX
	SHRQ    $2, CX
	XORQ    R9, R9

atanloop:
	VMOVUPD   (SI), Y0
	VMOVUPD   (DX), Y1
	ATAN24
	VMOVUPD   Y10, (DI)
	VCMPPD    $3, Y10, Y10, Y13
	VMOVMSKPD Y13, AX
	POPCNTQ   AX, AX
	ADDQ      AX, R9
	ADDQ      $32, SI
	ADDQ      $32, DX
	ADDQ      $32, DI
	DECQ      CX
	JNZ       atanloop

	VZEROUPPER
	MOVQ R9, special+32(FP)
	RET

// The passes of the row (see vortexRowAVX2). DI holds w, whose five rows
// (x, y, y·s, x(x − s) + y², r₁²/r₂²) stand BX = n·8 bytes apart, and
// R8–R12 the arrays x0, y0, tx, ty, s (R8 and R9 hold ca and cb for the
// last pass); in each pass CX counts the vectors, SI is the offset in bytes
// of the current one, and AX and R13 point to the rows it reads or writes.

// FRAME sets u = a·tx + b·ty and v = b·tx − a·ty, the components of (a, b)
// along the panel's tangent (tx, ty) and its normal (−ty, tx); t is scratch.
#define FRAME(a, b, tx, ty, u, v, t) \
	VMULPD a, tx, u \
	VMULPD b, ty, v \
	VADDPD v, u, u \
	VMULPD b, tx, v \
	VMULPD a, ty, t \
	VSUBPD t, v, v

// ROWGEOMETRY, with AX = arr, CX = n, DX = p and DI = w, loads the arrays,
// sets BX = n·8, broadcasts the point (px, py) = p[0:2] and writes the
// point in each panel's frame: x, y (FRAME of dx = px − x0, dy = py − y0),
// y·s, x(x − s) + y², and r₁²/r₂² = (x² + y²)/((x − s)² + y²).
#define ROWGEOMETRY(lg, dx, dy, px, py, tx, ty, x, y, s, xs, yy, ys, g, r1, r2) \
	MOVQ         0(AX), R8   /* x0 */ \
	MOVQ         24(AX), R9  /* y0 */ \
	MOVQ         48(AX), R10 /* tx */ \
	MOVQ         72(AX), R11 /* ty */ \
	MOVQ         96(AX), R12 /* s */ \
	MOVQ         CX, BX \
	SHLQ         $3, BX \
	SHRQ         $lg, CX \
	XORQ         SI, SI \
	VBROADCASTSD 0(DX), px \
	VBROADCASTSD 8(DX), py \
geometry: \
	VSUBPD  (R8)(SI*1), px, dx \
	VSUBPD  (R9)(SI*1), py, dy \
	VMOVUPD (R10)(SI*1), tx \
	VMOVUPD (R11)(SI*1), ty \
	FRAME(dx, dy, tx, ty, x, y, s) \
	VMOVUPD (R12)(SI*1), s \
	VSUBPD  s, x, xs \
	VMULPD  y, y, yy \
	VMULPD  s, y, ys \
	VMULPD  xs, x, g \
	VADDPD  yy, g, g \
	VMULPD  x, x, r1 \
	VADDPD  yy, r1, r1 \
	VMULPD  xs, xs, r2 \
	VADDPD  yy, r2, r2 \
	VDIVPD  r2, r1, r1 \
	MOVQ    DI, AX \
	VMOVUPD x, (AX)(SI*1) \
	ADDQ    BX, AX \
	VMOVUPD y, (AX)(SI*1) \
	ADDQ    BX, AX \
	VMOVUPD ys, (AX)(SI*1) \
	ADDQ    BX, AX \
	VMOVUPD g, (AX)(SI*1) \
	ADDQ    BX, AX \
	VMOVUPD r1, (AX)(SI*1) \
	ADDQ    $(8<<lg), SI \
	DECQ    CX \
	JNZ     geometry

// ROWLOGS writes ½ln(r₁²/r₂²) in place of the ratio; LOG is LOG4 or LOG8,
// which sets lnx = ln x.
#define ROWLOGS(lg, LOG, mulc, x, lnx) \
	LEAQ (DI)(BX*4), AX \
	MOVQ BX, CX \
	SHRQ $(lg+3), CX \
	XORQ SI, SI \
logs: \
	VMOVUPD (AX)(SI*1), x \
	LOG \
	mulc    half, lnx, lnx \
	VMOVUPD lnx, (AX)(SI*1) \
	ADDQ    $(8<<lg), SI \
	DECQ    CX \
	JNZ     logs

// ROWANGLES writes β = atan2(y·s, x(x − s) + y²) in place of y·s; ATAN is
// ATAN24 or ATAN28, which sets a = atan2(y, x).
#define ROWANGLES(lg, ATAN, y, x, a) \
	LEAQ (DI)(BX*2), AX \
	LEAQ (AX)(BX*1), R13 \
	MOVQ BX, CX \
	SHRQ $(lg+3), CX \
	XORQ SI, SI \
angles: \
	VMOVUPD (AX)(SI*1), y \
	VMOVUPD (R13)(SI*1), x \
	ATAN \
	VMOVUPD a, (AX)(SI*1) \
	ADDQ    $(8<<lg), SI \
	DECQ    CX \
	JNZ     angles

// ROWNORMAL, with DX = p, sets CX to the count, R13, AX and BX to the
// rows y, β and l = ½ln(r₁²/r₂²), and broadcasts the normal (nx, ny) =
// p[2:4].
#define ROWNORMAL(lg, nx, ny) \
	MOVQ         BX, CX \
	SHRQ         $(lg+3), CX \
	LEAQ         (DI)(BX*1), R13 \
	LEAQ         (R13)(BX*1), AX \
	LEAQ         (AX)(BX*2), BX \
	VBROADCASTSD 16(DX), nx \
	VBROADCASTSD 24(DX), ny

// ROWCOEFFS, with R8 = ca, R9 = cb and DX = arr, writes the coefficients:
// I1u = xβ − y·l, I1v = x·l − s + yβ; u1 = I1u·(1/s), v1 = I1v·(1/s);
// tn = t·n and ln = nL·n (FRAME of the normal, into x and y); ua =
// −(β − u1)/2π, ub = −u1/2π, va = (l − v1)/2π, vb = v1/2π; ca = ua·tn +
// va·ln, cb = ub·tn + vb·ln. inv holds 1/s and c 1/2π; tx, t and, once
// used, s are scratch.
#define ROWCOEFFS(lg, loadc, u1, v1, nx, ny, tx, ty, x, y, t, s, beta, l, inv, c) \
	MOVQ    120(DX), DX \
	loadc   inv2pi, c \
	XORQ    SI, SI \
coeffs: \
	VMOVUPD (DI)(SI*1), x \
	VMOVUPD (R13)(SI*1), y \
	VMOVUPD (BX)(SI*1), l \
	VMOVUPD (AX)(SI*1), beta /* β */ \
	VMOVUPD (R12)(SI*1), s \
	VMOVUPD (DX)(SI*1), inv \
	VMULPD  beta, x, u1 \
	VMULPD  l, y, v1 \
	VSUBPD  v1, u1, u1       /* I1u */ \
	VMULPD  inv, u1, u1      /* u1 */ \
	VMULPD  l, x, v1 \
	VSUBPD  s, v1, v1 \
	VMULPD  beta, y, tx \
	VADDPD  tx, v1, v1       /* I1v */ \
	VMULPD  inv, v1, v1      /* v1 */ \
	VMOVUPD (R10)(SI*1), tx \
	VMOVUPD (R11)(SI*1), ty \
	FRAME(nx, ny, tx, ty, x, y, t) \
	VSUBPD  u1, beta, t \
	VMULPD  c, t, t \
	VMULPD  x, t, t \
	VSUBPD  v1, l, s \
	VMULPD  c, s, s \
	VMULPD  y, s, s \
	VSUBPD  t, s, s          /* ca */ \
	VMOVUPD s, (R8)(SI*1) \
	VMULPD  c, u1, t \
	VMULPD  x, t, t \
	VMULPD  c, v1, s \
	VMULPD  y, s, s \
	VSUBPD  t, s, s          /* cb */ \
	VMOVUPD s, (R9)(SI*1) \
	ADDQ    $(8<<lg), SI \
	DECQ    CX \
	JNZ     coeffs

// func vortexRowAVX2(ca, cb *float64, arr *panelArrays, n int, p *[4]float64, w *float64)
//
// For panels j < n (a positive multiple of 4) and the point (px, py) with
// normal (nx, ny) = p[0:4], the coefficients of the node strengths γ_j
// (ca[j]) and γ_j+1 (cb[j]) in the normal velocity. arr holds the arrays
// x0, y0, tx, ty, s, 1/s of the panels; w is scratch for 5n values. The point
// must not be a panel's own midpoint (the caller redoes that one), nor on
// a panel.
//
// Four passes over the panels, each with short independent iterations so
// that the processor overlaps many of them: the point in each panel's
// frame (w: x, y, y·s, x(x − s) + y², r₁²/r₂²), the logarithm, the angle,
// and the coefficients. The operations are those of local and coeffs, in
// their order and unfused, so that the rounding is the Go code's: the
// logarithm of the rounded ratio r₁²/r₂² carries its rounding, which the
// formulas multiply by up to x/s.
TEXT ·vortexRowAVX2(SB), NOSPLIT, $0-48
	MOVQ arr+16(FP), AX
	MOVQ n+24(FP), CX
	MOVQ p+32(FP), DX
	MOVQ w+40(FP), DI
	ROWGEOMETRY(2, Y0, Y1, Y2, Y3, Y4, Y5, Y6, Y7, Y8, Y9, Y10, Y11, Y12, Y13, Y14)
	ROWLOGS(2, LOG4, VMULPD, Y0, Y12)
	ROWANGLES(2, ATAN24, Y0, Y1, Y10)
	MOVQ ca+0(FP), R8
	MOVQ cb+8(FP), R9
	ROWNORMAL(2, Y2, Y3)
	MOVQ arr+16(FP), DX
	ROWCOEFFS(2, VMOVUPD, Y0, Y1, Y2, Y3, Y4, Y5, Y6, Y7, Y8, Y9, Y10, Y11, Y12, Y15)
	VZEROUPPER
	RET

// func vortexRowAVX512(ca, cb *float64, arr *panelArrays, n int, p *[4]float64, w *float64)
//
// vortexRowAVX2 on eight panels at a time (n a positive multiple of 8),
// with the same operations in the same order on each lane: the same
// coefficients, bit for bit.
TEXT ·vortexRowAVX512(SB), NOSPLIT, $0-48
	MOVQ arr+16(FP), AX
	MOVQ n+24(FP), CX
	MOVQ p+32(FP), DX
	MOVQ w+40(FP), DI
	ROWGEOMETRY(3, Z0, Z1, Z2, Z3, Z4, Z5, Z6, Z7, Z8, Z9, Z10, Z11, Z12, Z13, Z14)
	ROWLOGS(3, LOG8, VMULPD.BCST, Z0, Z12)
	ROWANGLES(3, ATAN28, Z0, Z1, Z10)
	MOVQ ca+0(FP), R8
	MOVQ cb+8(FP), R9
	ROWNORMAL(3, Z2, Z3)
	MOVQ arr+16(FP), DX
	ROWCOEFFS(3, VBROADCASTSD, Z0, Z1, Z2, Z3, Z4, Z5, Z6, Z7, Z8, Z9, Z10, Z11, Z12, Z15)
	VZEROUPPER
	RET
