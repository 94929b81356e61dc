//go:build !purego

#include "textflag.h"

// The influence row of the vortex-panel build, four panels at a time with
// AVX2 and FMA (see influence_amd64.go and fillRow for the formulas). The
// logarithm and the angle follow the algorithms and coefficients of Go's
// math.Log (FreeBSD's e_log.c) and math.Atan (Cephes), with the quadrants
// of atan2 resolved by masks instead of branches; logAVX2 and atan2AVX2
// run the same code over slices for the tests against the math package.

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


// LOG4 sets Y12 = ln Y0 for Y0 in [minnorm, maxf], and Y1 to the mask of
// those lanes; it uses Y0–Y12. The steps and their order are those of Go's
// math.Log on amd64 (log_amd64.s), unfused, so the results are the same:
// x = m·2^e with m in [√½, √2) and k = e; f = m − 1, s = f/(2 + f);
// R = s²(L1 + s⁴(L3 + s⁴(L5 + s⁴L7))) + s⁴(L2 + s⁴(L4 + s⁴L6)), hfsq = f²/2;
// ln x = k·Ln2Hi − ((hfsq − (s(hfsq + R) + k·Ln2Lo)) − f).
#define LOG4 \
	VCMPPD    $0x1D, minnorm, Y0, Y1; \
	VCMPPD    $0x12, maxf, Y0, Y2; \
	VANDPD    Y2, Y1, Y1; \
	VPSRLQ    $52, Y0, Y2; \
	VPOR      two52, Y2, Y2; \
	VSUBPD    bias, Y2, Y2; \
	VANDPD    mantmask, Y0, Y3; \
	VORPD     one, Y3, Y3; \
	VCMPPD    $0x1D, sqrt2, Y3, Y4; \
	VMULPD    half, Y3, Y5; \
	VBLENDVPD Y4, Y5, Y3, Y3; \
	VANDPD    one, Y4, Y4; \
	VADDPD    Y4, Y2, Y2; \
	VSUBPD    one, Y3, Y3; \
	VADDPD    two, Y3, Y4; \
	VDIVPD    Y4, Y3, Y4; \
	VMULPD    Y4, Y4, Y5; \
	VMULPD    Y5, Y5, Y6; \
	VMULPD    L7, Y6, Y7; \
	VADDPD    L5, Y7, Y7; \
	VMULPD    Y6, Y7, Y7; \
	VADDPD    L3, Y7, Y7; \
	VMULPD    Y6, Y7, Y7; \
	VADDPD    L1, Y7, Y7; \
	VMULPD    Y7, Y5, Y7; \
	VMULPD    L6, Y6, Y8; \
	VADDPD    L4, Y8, Y8; \
	VMULPD    Y6, Y8, Y8; \
	VADDPD    L2, Y8, Y8; \
	VMULPD    Y8, Y6, Y8; \
	VADDPD    Y8, Y7, Y7; \
	VMULPD    half, Y3, Y9; \
	VMULPD    Y3, Y9, Y9; \
	VADDPD    Y9, Y7, Y10; \
	VMULPD    Y10, Y4, Y10; \
	VMULPD    ln2lo, Y2, Y11; \
	VADDPD    Y11, Y10, Y10; \
	VSUBPD    Y10, Y9, Y11; \
	VSUBPD    Y3, Y11, Y11; \
	VMULPD    ln2hi, Y2, Y12; \
	VSUBPD    Y11, Y12, Y12

// ATAN24 sets Y10 = atan2(Y0, Y1); it uses Y0–Y14. The steps and their
// order are those of angle (angle.go), unfused, with the branches as masks,
// so the results are the same: with a = |y|, b = |x|, atan(a/b) =
// xatan(a/b) for a ≤ 0.66·b, π/4 + xatan((a − b)/(a + b)) + Morebits/2 up
// to a = b·tan 3π/8, π/2 − xatan(b/a) + Morebits beyond, where xatan(t) =
// t + t·(z·P(z)/Q(z)), z = t² (Go's math.Atan: Cephes); then π − atan if x
// is negative, and the sign of y. One division reduces the argument where
// math.Atan2 takes two (y/x, then the reduction of the rounded quotient);
// the results are within a unit in the last place of math.Atan2. Both
// arguments zero, both infinite, or a NaN give NaN.
#define ATAN24 \
	VANDPD    absmask, Y0, Y2; \
	VANDPD    absmask, Y1, Y3; \
	VMULPD    tan3pio8, Y3, Y4; \
	VCMPPD    $0x1E, Y4, Y2, Y5; \
	VMULPD    c066, Y3, Y4; \
	VCMPPD    $0x12, Y4, Y2, Y6; \
	VSUBPD    Y3, Y2, Y7; \
	VADDPD    Y3, Y2, Y8; \
	VBLENDVPD Y6, Y2, Y7, Y7; \
	VBLENDVPD Y6, Y3, Y8, Y8; \
	VBLENDVPD Y5, Y3, Y7, Y7; \
	VBLENDVPD Y5, Y2, Y8, Y8; \
	VDIVPD    Y8, Y7, Y7; \
	VMULPD    Y7, Y7, Y9; \
	VMULPD    P0, Y9, Y10; \
	VADDPD    P1, Y10, Y10; \
	VMULPD    Y9, Y10, Y10; \
	VADDPD    P2, Y10, Y10; \
	VMULPD    Y9, Y10, Y10; \
	VADDPD    P3, Y10, Y10; \
	VMULPD    Y9, Y10, Y10; \
	VADDPD    P4, Y10, Y10; \
	VADDPD    Q0, Y9, Y11; \
	VMULPD    Y9, Y11, Y11; \
	VADDPD    Q1, Y11, Y11; \
	VMULPD    Y9, Y11, Y11; \
	VADDPD    Q2, Y11, Y11; \
	VMULPD    Y9, Y11, Y11; \
	VADDPD    Q3, Y11, Y11; \
	VMULPD    Y9, Y11, Y11; \
	VADDPD    Q4, Y11, Y11; \
	VMULPD    Y10, Y9, Y10; \
	VDIVPD    Y11, Y10, Y10; \
	VMULPD    Y10, Y7, Y10; \
	VADDPD    Y7, Y10, Y10; \
	VADDPD    pio4, Y10, Y12; \
	VADDPD    halfmb, Y12, Y12; \
	VMOVUPD   pio2, Y13; \
	VSUBPD    Y10, Y13, Y13; \
	VADDPD    morebits, Y13, Y13; \
	VBLENDVPD Y5, Y13, Y12, Y12; \
	VBLENDVPD Y6, Y10, Y12, Y10; \
	VMOVUPD   pi, Y12; \
	VSUBPD    Y10, Y12, Y12; \
	VBLENDVPD Y1, Y12, Y10, Y10; \
	VANDPD    signmask, Y0, Y12; \
	VORPD     Y12, Y10, Y10

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
	MOVQ 0(AX), R8   // x0
	MOVQ 24(AX), R9  // y0
	MOVQ 48(AX), R10 // tx
	MOVQ 72(AX), R11 // ty
	MOVQ 96(AX), R12 // s
	MOVQ CX, BX
	SHLQ $3, BX      // n·8: the stride between the scratch arrays
	SHRQ $2, CX
	XORQ SI, SI
	VBROADCASTSD 0(DX), Y2
	VBROADCASTSD 8(DX), Y3

geometry:
	VSUBPD  (R8)(SI*1), Y2, Y0 // dx
	VSUBPD  (R9)(SI*1), Y3, Y1 // dy
	VMOVUPD (R10)(SI*1), Y4    // tx
	VMOVUPD (R11)(SI*1), Y5    // ty
	VMULPD  Y0, Y4, Y6
	VMULPD  Y1, Y5, Y7
	VADDPD  Y7, Y6, Y6         // x = dx·tx + dy·ty
	VMULPD  Y1, Y4, Y7
	VMULPD  Y0, Y5, Y8
	VSUBPD  Y8, Y7, Y7         // y = dy·tx − dx·ty
	VMOVUPD (R12)(SI*1), Y8    // s
	VSUBPD  Y8, Y6, Y9         // xs = x − s
	VMULPD  Y7, Y7, Y10        // y²
	VMULPD  Y8, Y7, Y11        // y·s
	VMULPD  Y9, Y6, Y12
	VADDPD  Y10, Y12, Y12      // x·xs + y²
	VMULPD  Y6, Y6, Y13
	VADDPD  Y10, Y13, Y13      // r₁²
	VMULPD  Y9, Y9, Y14
	VADDPD  Y10, Y14, Y14      // r₂²
	VDIVPD  Y14, Y13, Y13      // r₁²/r₂²
	MOVQ    DI, AX
	VMOVUPD Y6, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Y7, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Y11, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Y12, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Y13, (AX)(SI*1)
	ADDQ    $32, SI
	DECQ    CX
	JNZ     geometry

	// ½ln(r₁²/r₂²) in place of the ratio
	LEAQ (DI)(BX*4), AX
	MOVQ BX, CX
	SHRQ $5, CX
	XORQ SI, SI

logs:
	VMOVUPD (AX)(SI*1), Y0
	LOG4
	VMULPD  half, Y12, Y12
	VMOVUPD Y12, (AX)(SI*1)
	ADDQ    $32, SI
	DECQ    CX
	JNZ     logs

	// β = atan2(y·s, x(x − s) + y²) in place of y·s
	LEAQ (DI)(BX*2), AX
	LEAQ (AX)(BX*1), R13
	MOVQ BX, CX
	SHRQ $5, CX
	XORQ SI, SI

angles:
	VMOVUPD (AX)(SI*1), Y0
	VMOVUPD (R13)(SI*1), Y1
	ATAN24
	VMOVUPD Y10, (AX)(SI*1)
	ADDQ    $32, SI
	DECQ    CX
	JNZ     angles

	// The coefficients.
	MOVQ         ca+0(FP), R8
	MOVQ         cb+8(FP), R9
	MOVQ         BX, CX
	SHRQ         $5, CX
	LEAQ         (DI)(BX*1), R13 // y
	LEAQ         (R13)(BX*1), AX // β
	LEAQ         (AX)(BX*2), BX  // l
	VBROADCASTSD 16(DX), Y2      // nx
	VBROADCASTSD 24(DX), Y3      // ny
	MOVQ         arr+16(FP), DX
	MOVQ         120(DX), DX     // 1/s
	VMOVUPD      inv2pi, Y15
	XORQ         SI, SI

coeffs:
	// I1u = xβ − y·l, I1v = x·l − s + yβ; u1 = I1u·(1/s), v1 = I1v·(1/s)
	VMOVUPD (DI)(SI*1), Y6     // x
	VMOVUPD (R13)(SI*1), Y7    // y
	VMOVUPD (BX)(SI*1), Y11    // l
	VMOVUPD (AX)(SI*1), Y10    // β
	VMOVUPD (R12)(SI*1), Y9    // s
	VMOVUPD (DX)(SI*1), Y12    // 1/s
	VMULPD  Y10, Y6, Y0
	VMULPD  Y11, Y7, Y1
	VSUBPD  Y1, Y0, Y0         // I1u
	VMULPD  Y12, Y0, Y0        // u1
	VMULPD  Y11, Y6, Y1
	VSUBPD  Y9, Y1, Y1
	VMULPD  Y10, Y7, Y4
	VADDPD  Y4, Y1, Y1         // I1v
	VMULPD  Y12, Y1, Y1        // v1

	// tn = t·n, ln = nL·n
	VMOVUPD (R10)(SI*1), Y4    // tx
	VMOVUPD (R11)(SI*1), Y5    // ty
	VMULPD  Y2, Y4, Y6
	VMULPD  Y3, Y5, Y7
	VADDPD  Y7, Y6, Y6         // tn
	VMULPD  Y3, Y4, Y7
	VMULPD  Y2, Y5, Y8
	VSUBPD  Y8, Y7, Y7         // ln

	// ua = −(β − u1)/2π, ub = −u1/2π, va = (l − v1)/2π, vb = v1/2π;
	// ca = ua·tn + va·ln, cb = ub·tn + vb·ln
	VSUBPD  Y0, Y10, Y8
	VMULPD  Y15, Y8, Y8
	VMULPD  Y6, Y8, Y8         // (β − u1)/2π · tn
	VSUBPD  Y1, Y11, Y9
	VMULPD  Y15, Y9, Y9
	VMULPD  Y7, Y9, Y9         // va·ln
	VSUBPD  Y8, Y9, Y9         // ca
	VMOVUPD Y9, (R8)(SI*1)
	VMULPD  Y15, Y0, Y8
	VMULPD  Y6, Y8, Y8         // u1/2π · tn
	VMULPD  Y15, Y1, Y9
	VMULPD  Y7, Y9, Y9         // vb·ln
	VSUBPD  Y8, Y9, Y9         // cb
	VMOVUPD Y9, (R9)(SI*1)
	ADDQ    $32, SI
	DECQ    CX
	JNZ     coeffs

	VZEROUPPER
	RET

// LOG8 sets Z12 = ln Z0 for Z0 in [minnorm, maxf] (other lanes are not
// marked: the row's ratios are in the domain); it uses Z0–Z12 and K3. The
// operations of LOG4 on eight lanes, in its order, with the constants
// broadcast from their first lane and the reduction's branch as a mask.
#define LOG8 \
	VPSRLQ           $52, Z0, Z2; \
	VPORQ.BCST       two52, Z2, Z2; \
	VSUBPD.BCST      bias, Z2, Z2; \
	VPANDQ.BCST      mantmask, Z0, Z3; \
	VPORQ.BCST       one, Z3, Z3; \
	VCMPPD.BCST      $0x1D, sqrt2, Z3, K3; \
	VMULPD.BCST      half, Z3, Z5; \
	VBLENDMPD        Z5, Z3, K3, Z3; \
	VADDPD.BCST      one, Z2, K3, Z2; \
	VSUBPD.BCST      one, Z3, Z3; \
	VADDPD.BCST      two, Z3, Z4; \
	VDIVPD           Z4, Z3, Z4; \
	VMULPD           Z4, Z4, Z5; \
	VMULPD           Z5, Z5, Z6; \
	VMULPD.BCST      L7, Z6, Z7; \
	VADDPD.BCST      L5, Z7, Z7; \
	VMULPD           Z6, Z7, Z7; \
	VADDPD.BCST      L3, Z7, Z7; \
	VMULPD           Z6, Z7, Z7; \
	VADDPD.BCST      L1, Z7, Z7; \
	VMULPD           Z7, Z5, Z7; \
	VMULPD.BCST      L6, Z6, Z8; \
	VADDPD.BCST      L4, Z8, Z8; \
	VMULPD           Z6, Z8, Z8; \
	VADDPD.BCST      L2, Z8, Z8; \
	VMULPD           Z8, Z6, Z8; \
	VADDPD           Z8, Z7, Z7; \
	VMULPD.BCST      half, Z3, Z9; \
	VMULPD           Z3, Z9, Z9; \
	VADDPD           Z9, Z7, Z10; \
	VMULPD           Z10, Z4, Z10; \
	VMULPD.BCST      ln2lo, Z2, Z11; \
	VADDPD           Z11, Z10, Z10; \
	VSUBPD           Z10, Z9, Z11; \
	VSUBPD           Z3, Z11, Z11; \
	VMULPD.BCST      ln2hi, Z2, Z12; \
	VSUBPD           Z11, Z12, Z12

// ATAN28 sets Z10 = atan2(Z0, Z1); it uses Z0–Z13 and K1–K3. The
// operations of ATAN24 on eight lanes, in its order, with the branches as
// masks.
#define ATAN28 \
	VPANDQ.BCST      absmask, Z0, Z2; \
	VPANDQ.BCST      absmask, Z1, Z3; \
	VMULPD.BCST      tan3pio8, Z3, Z4; \
	VCMPPD           $0x1E, Z4, Z2, K1; \
	VMULPD.BCST      c066, Z3, Z4; \
	VCMPPD           $0x12, Z4, Z2, K2; \
	VSUBPD           Z3, Z2, Z7; \
	VADDPD           Z3, Z2, Z8; \
	VBLENDMPD        Z2, Z7, K2, Z7; \
	VBLENDMPD        Z3, Z8, K2, Z8; \
	VBLENDMPD        Z3, Z7, K1, Z7; \
	VBLENDMPD        Z2, Z8, K1, Z8; \
	VDIVPD           Z8, Z7, Z7; \
	VMULPD           Z7, Z7, Z9; \
	VMULPD.BCST      P0, Z9, Z10; \
	VADDPD.BCST      P1, Z10, Z10; \
	VMULPD           Z9, Z10, Z10; \
	VADDPD.BCST      P2, Z10, Z10; \
	VMULPD           Z9, Z10, Z10; \
	VADDPD.BCST      P3, Z10, Z10; \
	VMULPD           Z9, Z10, Z10; \
	VADDPD.BCST      P4, Z10, Z10; \
	VADDPD.BCST      Q0, Z9, Z11; \
	VMULPD           Z9, Z11, Z11; \
	VADDPD.BCST      Q1, Z11, Z11; \
	VMULPD           Z9, Z11, Z11; \
	VADDPD.BCST      Q2, Z11, Z11; \
	VMULPD           Z9, Z11, Z11; \
	VADDPD.BCST      Q3, Z11, Z11; \
	VMULPD           Z9, Z11, Z11; \
	VADDPD.BCST      Q4, Z11, Z11; \
	VMULPD           Z10, Z9, Z10; \
	VDIVPD           Z11, Z10, Z10; \
	VMULPD           Z10, Z7, Z10; \
	VADDPD           Z7, Z10, Z10; \
	VADDPD.BCST      pio4, Z10, Z12; \
	VADDPD.BCST      halfmb, Z12, Z12; \
	VBROADCASTSD     pio2, Z13; \
	VSUBPD           Z10, Z13, Z13; \
	VADDPD.BCST      morebits, Z13, Z13; \
	VBLENDMPD        Z13, Z12, K1, Z12; \
	VBLENDMPD        Z10, Z12, K2, Z10; \
	VBROADCASTSD     pi, Z12; \
	VSUBPD           Z10, Z12, Z12; \
	VPTESTMQ.BCST    signmask, Z1, K3; \
	VBLENDMPD        Z12, Z10, K3, Z10; \
	VPANDQ.BCST      signmask, Z0, Z12; \
	VPORQ            Z12, Z10, Z10

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
	MOVQ 0(AX), R8   // x0
	MOVQ 24(AX), R9  // y0
	MOVQ 48(AX), R10 // tx
	MOVQ 72(AX), R11 // ty
	MOVQ 96(AX), R12 // s
	MOVQ CX, BX
	SHLQ $3, BX      // n·8: the stride between the scratch arrays
	SHRQ $3, CX
	XORQ SI, SI
	VBROADCASTSD 0(DX), Z2
	VBROADCASTSD 8(DX), Z3

geometry8:
	VSUBPD  (R8)(SI*1), Z2, Z0 // dx
	VSUBPD  (R9)(SI*1), Z3, Z1 // dy
	VMOVUPD (R10)(SI*1), Z4    // tx
	VMOVUPD (R11)(SI*1), Z5    // ty
	VMULPD  Z0, Z4, Z6
	VMULPD  Z1, Z5, Z7
	VADDPD  Z7, Z6, Z6         // x = dx·tx + dy·ty
	VMULPD  Z1, Z4, Z7
	VMULPD  Z0, Z5, Z8
	VSUBPD  Z8, Z7, Z7         // y = dy·tx − dx·ty
	VMOVUPD (R12)(SI*1), Z8    // s
	VSUBPD  Z8, Z6, Z9         // xs = x − s
	VMULPD  Z7, Z7, Z10        // y²
	VMULPD  Z8, Z7, Z11        // y·s
	VMULPD  Z9, Z6, Z12
	VADDPD  Z10, Z12, Z12      // x·xs + y²
	VMULPD  Z6, Z6, Z13
	VADDPD  Z10, Z13, Z13      // r₁²
	VMULPD  Z9, Z9, Z14
	VADDPD  Z10, Z14, Z14      // r₂²
	VDIVPD  Z14, Z13, Z13      // r₁²/r₂²
	MOVQ    DI, AX
	VMOVUPD Z6, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Z7, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Z11, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Z12, (AX)(SI*1)
	ADDQ    BX, AX
	VMOVUPD Z13, (AX)(SI*1)
	ADDQ    $64, SI
	DECQ    CX
	JNZ     geometry8

	// ½ln(r₁²/r₂²) in place of the ratio
	LEAQ (DI)(BX*4), AX
	MOVQ BX, CX
	SHRQ $6, CX
	XORQ SI, SI

logs8:
	VMOVUPD     (AX)(SI*1), Z0
	LOG8
	VMULPD.BCST half, Z12, Z12
	VMOVUPD     Z12, (AX)(SI*1)
	ADDQ        $64, SI
	DECQ        CX
	JNZ         logs8

	// β = atan2(y·s, x(x − s) + y²) in place of y·s
	LEAQ (DI)(BX*2), AX
	LEAQ (AX)(BX*1), R13
	MOVQ BX, CX
	SHRQ $6, CX
	XORQ SI, SI

angles8:
	VMOVUPD (AX)(SI*1), Z0
	VMOVUPD (R13)(SI*1), Z1
	ATAN28
	VMOVUPD Z10, (AX)(SI*1)
	ADDQ    $64, SI
	DECQ    CX
	JNZ     angles8

	// The coefficients.
	MOVQ         ca+0(FP), R8
	MOVQ         cb+8(FP), R9
	MOVQ         BX, CX
	SHRQ         $6, CX
	LEAQ         (DI)(BX*1), R13 // y
	LEAQ         (R13)(BX*1), AX // β
	LEAQ         (AX)(BX*2), BX  // l
	VBROADCASTSD 16(DX), Z2      // nx
	VBROADCASTSD 24(DX), Z3      // ny
	MOVQ         arr+16(FP), DX
	MOVQ         120(DX), DX     // 1/s
	VBROADCASTSD inv2pi, Z15
	XORQ         SI, SI

coeffs8:
	VMOVUPD (DI)(SI*1), Z6     // x
	VMOVUPD (R13)(SI*1), Z7    // y
	VMOVUPD (BX)(SI*1), Z11    // l
	VMOVUPD (AX)(SI*1), Z10    // β
	VMOVUPD (R12)(SI*1), Z9    // s
	VMOVUPD (DX)(SI*1), Z12    // 1/s
	VMULPD  Z10, Z6, Z0
	VMULPD  Z11, Z7, Z1
	VSUBPD  Z1, Z0, Z0         // I1u
	VMULPD  Z12, Z0, Z0        // u1
	VMULPD  Z11, Z6, Z1
	VSUBPD  Z9, Z1, Z1
	VMULPD  Z10, Z7, Z4
	VADDPD  Z4, Z1, Z1         // I1v
	VMULPD  Z12, Z1, Z1        // v1
	VMOVUPD (R10)(SI*1), Z4    // tx
	VMOVUPD (R11)(SI*1), Z5    // ty
	VMULPD  Z2, Z4, Z6
	VMULPD  Z3, Z5, Z7
	VADDPD  Z7, Z6, Z6         // tn
	VMULPD  Z3, Z4, Z7
	VMULPD  Z2, Z5, Z8
	VSUBPD  Z8, Z7, Z7         // ln
	VSUBPD  Z0, Z10, Z8
	VMULPD  Z15, Z8, Z8
	VMULPD  Z6, Z8, Z8         // (β − u1)/2π · tn
	VSUBPD  Z1, Z11, Z9
	VMULPD  Z15, Z9, Z9
	VMULPD  Z7, Z9, Z9         // va·ln
	VSUBPD  Z8, Z9, Z9         // ca
	VMOVUPD Z9, (R8)(SI*1)
	VMULPD  Z15, Z0, Z8
	VMULPD  Z6, Z8, Z8         // u1/2π · tn
	VMULPD  Z15, Z1, Z9
	VMULPD  Z7, Z9, Z9         // vb·ln
	VSUBPD  Z8, Z9, Z9         // cb
	VMOVUPD Z9, (R9)(SI*1)
	ADDQ    $64, SI
	DECQ    CX
	JNZ     coeffs8

	VZEROUPPER
	RET
