//go:build !purego

#include "textflag.h"

// func kernAVX2(k int, a, b, c *float64, ldc int)
//
// C[0:6][0:8] -= Σ_p a[6p+r]·b[8p+j] for a packed 6-row sliver a, a packed
// 8-column sliver b and a row-major tile c with row stride ldc. Twelve
// accumulators Y0–Y11 hold the tile; Y12, Y13 the row of b; Y14 the
// broadcast entry of a. k ≥ 1.
TEXT ·kernAVX2(SB), NOSPLIT, $0-40
	MOVQ k+0(FP), CX
	MOVQ a+8(FP), SI
	MOVQ b+16(FP), DI
	MOVQ c+24(FP), DX
	MOVQ ldc+32(FP), R8
	SHLQ $3, R8

	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1
	VXORPD Y2, Y2, Y2
	VXORPD Y3, Y3, Y3
	VXORPD Y4, Y4, Y4
	VXORPD Y5, Y5, Y5
	VXORPD Y6, Y6, Y6
	VXORPD Y7, Y7, Y7
	VXORPD Y8, Y8, Y8
	VXORPD Y9, Y9, Y9
	VXORPD Y10, Y10, Y10
	VXORPD Y11, Y11, Y11

	MOVQ CX, BX
	SHRQ $1, BX
	JZ   tail

loop2:
	VMOVUPD      (DI), Y12
	VMOVUPD      32(DI), Y13
	VBROADCASTSD (SI), Y14
	VFMADD231PD  Y12, Y14, Y0
	VFMADD231PD  Y13, Y14, Y1
	VBROADCASTSD 8(SI), Y14
	VFMADD231PD  Y12, Y14, Y2
	VFMADD231PD  Y13, Y14, Y3
	VBROADCASTSD 16(SI), Y14
	VFMADD231PD  Y12, Y14, Y4
	VFMADD231PD  Y13, Y14, Y5
	VBROADCASTSD 24(SI), Y14
	VFMADD231PD  Y12, Y14, Y6
	VFMADD231PD  Y13, Y14, Y7
	VBROADCASTSD 32(SI), Y14
	VFMADD231PD  Y12, Y14, Y8
	VFMADD231PD  Y13, Y14, Y9
	VBROADCASTSD 40(SI), Y14
	VFMADD231PD  Y12, Y14, Y10
	VFMADD231PD  Y13, Y14, Y11

	VMOVUPD      64(DI), Y12
	VMOVUPD      96(DI), Y13
	VBROADCASTSD 48(SI), Y14
	VFMADD231PD  Y12, Y14, Y0
	VFMADD231PD  Y13, Y14, Y1
	VBROADCASTSD 56(SI), Y14
	VFMADD231PD  Y12, Y14, Y2
	VFMADD231PD  Y13, Y14, Y3
	VBROADCASTSD 64(SI), Y14
	VFMADD231PD  Y12, Y14, Y4
	VFMADD231PD  Y13, Y14, Y5
	VBROADCASTSD 72(SI), Y14
	VFMADD231PD  Y12, Y14, Y6
	VFMADD231PD  Y13, Y14, Y7
	VBROADCASTSD 80(SI), Y14
	VFMADD231PD  Y12, Y14, Y8
	VFMADD231PD  Y13, Y14, Y9
	VBROADCASTSD 88(SI), Y14
	VFMADD231PD  Y12, Y14, Y10
	VFMADD231PD  Y13, Y14, Y11

	ADDQ $96, SI
	ADDQ $128, DI
	DECQ BX
	JNZ  loop2

tail:
	ANDQ $1, CX
	JZ   store
	VMOVUPD      (DI), Y12
	VMOVUPD      32(DI), Y13
	VBROADCASTSD (SI), Y14
	VFMADD231PD  Y12, Y14, Y0
	VFMADD231PD  Y13, Y14, Y1
	VBROADCASTSD 8(SI), Y14
	VFMADD231PD  Y12, Y14, Y2
	VFMADD231PD  Y13, Y14, Y3
	VBROADCASTSD 16(SI), Y14
	VFMADD231PD  Y12, Y14, Y4
	VFMADD231PD  Y13, Y14, Y5
	VBROADCASTSD 24(SI), Y14
	VFMADD231PD  Y12, Y14, Y6
	VFMADD231PD  Y13, Y14, Y7
	VBROADCASTSD 32(SI), Y14
	VFMADD231PD  Y12, Y14, Y8
	VFMADD231PD  Y13, Y14, Y9
	VBROADCASTSD 40(SI), Y14
	VFMADD231PD  Y12, Y14, Y10
	VFMADD231PD  Y13, Y14, Y11

store:
	VMOVUPD (DX), Y12
	VMOVUPD 32(DX), Y13
	VSUBPD  Y0, Y12, Y12
	VSUBPD  Y1, Y13, Y13
	VMOVUPD Y12, (DX)
	VMOVUPD Y13, 32(DX)
	ADDQ    R8, DX
	VMOVUPD (DX), Y12
	VMOVUPD 32(DX), Y13
	VSUBPD  Y2, Y12, Y12
	VSUBPD  Y3, Y13, Y13
	VMOVUPD Y12, (DX)
	VMOVUPD Y13, 32(DX)
	ADDQ    R8, DX
	VMOVUPD (DX), Y12
	VMOVUPD 32(DX), Y13
	VSUBPD  Y4, Y12, Y12
	VSUBPD  Y5, Y13, Y13
	VMOVUPD Y12, (DX)
	VMOVUPD Y13, 32(DX)
	ADDQ    R8, DX
	VMOVUPD (DX), Y12
	VMOVUPD 32(DX), Y13
	VSUBPD  Y6, Y12, Y12
	VSUBPD  Y7, Y13, Y13
	VMOVUPD Y12, (DX)
	VMOVUPD Y13, 32(DX)
	ADDQ    R8, DX
	VMOVUPD (DX), Y12
	VMOVUPD 32(DX), Y13
	VSUBPD  Y8, Y12, Y12
	VSUBPD  Y9, Y13, Y13
	VMOVUPD Y12, (DX)
	VMOVUPD Y13, 32(DX)
	ADDQ    R8, DX
	VMOVUPD (DX), Y12
	VMOVUPD 32(DX), Y13
	VSUBPD  Y10, Y12, Y12
	VSUBPD  Y11, Y13, Y13
	VMOVUPD Y12, (DX)
	VMOVUPD Y13, 32(DX)
	VZEROUPPER
	RET

// func axpyAVX2(alpha float64, x, y *float64, n int)
//
// y[i] += alpha·x[i] for i < n, sixteen entries per iteration, then four,
// then one.
TEXT ·axpyAVX2(SB), NOSPLIT, $0-32
	MOVQ         x+8(FP), SI
	MOVQ         y+16(FP), DI
	MOVQ         n+24(FP), CX
	VBROADCASTSD alpha+0(FP), Y0

axpy16:
	CMPQ        CX, $16
	JLT         axpy4
	VMOVUPD     (DI), Y1
	VMOVUPD     32(DI), Y2
	VMOVUPD     64(DI), Y3
	VMOVUPD     96(DI), Y4
	VFMADD231PD (SI), Y0, Y1
	VFMADD231PD 32(SI), Y0, Y2
	VFMADD231PD 64(SI), Y0, Y3
	VFMADD231PD 96(SI), Y0, Y4
	VMOVUPD     Y1, (DI)
	VMOVUPD     Y2, 32(DI)
	VMOVUPD     Y3, 64(DI)
	VMOVUPD     Y4, 96(DI)
	ADDQ        $128, SI
	ADDQ        $128, DI
	SUBQ        $16, CX
	JMP         axpy16

axpy4:
	CMPQ        CX, $4
	JLT         axpy1
	VMOVUPD     (DI), Y1
	VFMADD231PD (SI), Y0, Y1
	VMOVUPD     Y1, (DI)
	ADDQ        $32, SI
	ADDQ        $32, DI
	SUBQ        $4, CX
	JMP         axpy4

axpy1:
	TESTQ       CX, CX
	JZ          axpydone
	VMOVSD      (DI), X1
	VFMADD231SD (SI), X0, X1
	VMOVSD      X1, (DI)
	ADDQ        $8, SI
	ADDQ        $8, DI
	DECQ        CX
	JMP         axpy1

axpydone:
	VZEROUPPER
	RET

// func dotAVX2(x, y *float64, n int) float64
//
// Σ x[i]·y[i] for i < n in four 4-wide partial sums.
TEXT ·dotAVX2(SB), NOSPLIT, $0-32
	MOVQ   x+0(FP), SI
	MOVQ   y+8(FP), DI
	MOVQ   n+16(FP), CX
	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1
	VXORPD Y2, Y2, Y2
	VXORPD Y3, Y3, Y3

dot16:
	CMPQ        CX, $16
	JLT         dot4
	VMOVUPD     (SI), Y4
	VMOVUPD     32(SI), Y5
	VMOVUPD     64(SI), Y6
	VMOVUPD     96(SI), Y7
	VFMADD231PD (DI), Y4, Y0
	VFMADD231PD 32(DI), Y5, Y1
	VFMADD231PD 64(DI), Y6, Y2
	VFMADD231PD 96(DI), Y7, Y3
	ADDQ        $128, SI
	ADDQ        $128, DI
	SUBQ        $16, CX
	JMP         dot16

dot4:
	CMPQ        CX, $4
	JLT         dotsum
	VMOVUPD     (SI), Y4
	VFMADD231PD (DI), Y4, Y0
	ADDQ        $32, SI
	ADDQ        $32, DI
	SUBQ        $4, CX
	JMP         dot4

dotsum:
	VADDPD       Y1, Y0, Y0
	VADDPD       Y3, Y2, Y2
	VADDPD       Y2, Y0, Y0
	VEXTRACTF128 $1, Y0, X1
	VADDPD       X1, X0, X0
	VHADDPD      X0, X0, X0

dot1:
	TESTQ       CX, CX
	JZ          dotdone
	VMOVSD      (SI), X4
	VFMADD231SD (DI), X4, X0
	ADDQ        $8, SI
	ADDQ        $8, DI
	DECQ        CX
	JMP         dot1

dotdone:
	VZEROUPPER
	MOVSD X0, ret+24(FP)
	RET

// func rank1AVX2(a *float64, lda, rows, w int, inv float64) (pivot int)
//
// One step of elimination on rows below a pivot row: for each of rows rows
// r = 1, …, rows (row r starts at a + r·lda; row 0 is the pivot row, whose
// entries 1 … w−1 are u), l = a[r][0]·inv is stored in a[r][0] and
// a[r][1:w] −= l·u. It returns the r whose new a[r][1] is largest in
// magnitude (the first such; 1 if w < 2 or rows < 1), the next column's
// pivot. The caller checks that the rows lie in the matrix.
TEXT ·rank1AVX2(SB), NOSPLIT, $0-48
	MOVQ         a+0(FP), SI
	MOVQ         lda+8(FP), R8
	SHLQ         $3, R8
	MOVQ         rows+16(FP), R9
	MOVQ         w+24(FP), R10
	DECQ         R10               // entries after the first
	VMOVSD       inv+32(FP), X15
	MOVQ         $1, AX            // pivot
	MOVQ         $1, R11           // row
	VPCMPEQQ     Y13, Y13, Y13
	VPSRLQ       $1, Y13, Y13      // |x| mask
	MOVQ         $0xBFF0000000000000, R12
	MOVQ         R12, X14          // largest magnitude so far: −1 to start
	MOVQ         SI, DX
	ADDQ         $8, DX            // u
	TESTQ        R9, R9
	JLE          rank1done

rowloop:
	ADDQ         R8, SI            // row r
	VMOVSD       (SI), X0
	VMULSD       X15, X0, X0
	VMOVSD       X0, (SI)
	VBROADCASTSD X0, Y1            // l in every lane
	LEAQ         8(SI), DI         // row r, entry 1
	MOVQ         DX, BX            // u
	MOVQ         R10, CX

r16:
	CMPQ        CX, $16
	JLT         r4
	VMOVUPD     (DI), Y2
	VMOVUPD     32(DI), Y3
	VMOVUPD     64(DI), Y4
	VMOVUPD     96(DI), Y5
	VFNMADD231PD (BX), Y1, Y2
	VFNMADD231PD 32(BX), Y1, Y3
	VFNMADD231PD 64(BX), Y1, Y4
	VFNMADD231PD 96(BX), Y1, Y5
	VMOVUPD     Y2, (DI)
	VMOVUPD     Y3, 32(DI)
	VMOVUPD     Y4, 64(DI)
	VMOVUPD     Y5, 96(DI)
	ADDQ        $128, DI
	ADDQ        $128, BX
	SUBQ        $16, CX
	JMP         r16

r4:
	CMPQ        CX, $4
	JLT         r1
	VMOVUPD     (DI), Y2
	VFNMADD231PD (BX), Y1, Y2
	VMOVUPD     Y2, (DI)
	ADDQ        $32, DI
	ADDQ        $32, BX
	SUBQ        $4, CX
	JMP         r4

r1:
	TESTQ       CX, CX
	JZ          rowdone
	VMOVSD      (DI), X2
	VFNMADD231SD (BX), X1, X2
	VMOVSD      X2, (DI)
	ADDQ        $8, DI
	ADDQ        $8, BX
	DECQ        CX
	JMP         r1

rowdone:
	TESTQ    R10, R10
	JZ       next
	VMOVSD   8(SI), X2
	VANDPD   X13, X2, X2
	VUCOMISD X14, X2               // |a[r][1]| > largest? (false for NaN)
	JBE      next
	VMOVSD   X2, X14, X14
	MOVQ     R11, AX

next:
	INCQ R11
	CMPQ R11, R9
	JLE  rowloop

rank1done:
	VZEROUPPER
	MOVQ AX, pivot+40(FP)
	RET

// func asumAVX2(x *float64, n int) float64
//
// Σ |x[i]| for i < n in four 4-wide partial sums.
TEXT ·asumAVX2(SB), NOSPLIT, $0-24
	MOVQ     x+0(FP), SI
	MOVQ     n+8(FP), CX
	VPCMPEQQ Y5, Y5, Y5
	VPSRLQ   $1, Y5, Y5 // |x| mask
	VXORPD   Y0, Y0, Y0
	VXORPD   Y1, Y1, Y1
	VXORPD   Y2, Y2, Y2
	VXORPD   Y3, Y3, Y3

asum16:
	CMPQ   CX, $16
	JLT    asum4
	VANDPD (SI), Y5, Y6
	VANDPD 32(SI), Y5, Y7
	VANDPD 64(SI), Y5, Y8
	VANDPD 96(SI), Y5, Y9
	VADDPD Y6, Y0, Y0
	VADDPD Y7, Y1, Y1
	VADDPD Y8, Y2, Y2
	VADDPD Y9, Y3, Y3
	ADDQ   $128, SI
	SUBQ   $16, CX
	JMP    asum16

asum4:
	CMPQ   CX, $4
	JLT    asumsum
	VANDPD (SI), Y5, Y6
	VADDPD Y6, Y0, Y0
	ADDQ   $32, SI
	SUBQ   $4, CX
	JMP    asum4

asumsum:
	VADDPD       Y1, Y0, Y0
	VADDPD       Y3, Y2, Y2
	VADDPD       Y2, Y0, Y0
	VEXTRACTF128 $1, Y0, X1
	VADDPD       X1, X0, X0
	VHADDPD      X0, X0, X0

asum1:
	TESTQ  CX, CX
	JZ     asumdone
	VMOVSD (SI), X6
	VANDPD X5, X6, X6
	VADDSD X6, X0, X0
	ADDQ   $8, SI
	DECQ   CX
	JMP    asum1

asumdone:
	VZEROUPPER
	MOVSD X0, ret+16(FP)
	RET

// func dot2AVX2(r, x *float64, n int) (s0, s1 float64)
//
// s0 = Σ r[j]·x[2j] and s1 = Σ r[j]·x[2j+1] over n entries: the dot
// products of a row with the two columns of a row-major n×2 matrix.
TEXT ·dot2AVX2(SB), NOSPLIT, $0-40
	MOVQ   r+0(FP), SI
	MOVQ   x+8(FP), DI
	MOVQ   n+16(FP), CX
	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1

dot2x4:
	CMPQ        CX, $4
	JLT         dot2sum
	VMOVUPD     (SI), Y4
	VPERMPD     $0x50, Y4, Y5 // r0 r0 r1 r1
	VPERMPD     $0xFA, Y4, Y6 // r2 r2 r3 r3
	VFMADD231PD (DI), Y5, Y0
	VFMADD231PD 32(DI), Y6, Y1
	ADDQ        $32, SI
	ADDQ        $64, DI
	SUBQ        $4, CX
	JMP         dot2x4

dot2sum:
	VADDPD       Y1, Y0, Y0
	VEXTRACTF128 $1, Y0, X1
	VADDPD       X1, X0, X0 // s0 s1

dot2x1:
	TESTQ       CX, CX
	JZ          dot2done
	VMOVDDUP    (SI), X4
	VFMADD231PD (DI), X4, X0
	ADDQ        $8, SI
	ADDQ        $16, DI
	DECQ        CX
	JMP         dot2x1

dot2done:
	VMOVSD  X0, s0+24(FP)
	VMOVHPD X0, s1+32(FP)
	VZEROUPPER
	RET

// func axpy2AVX2(v0, v1 float64, r, x *float64, n int)
//
// x[2j] −= v0·r[j] and x[2j+1] −= v1·r[j] over n entries: a row taken
// from the two columns of a row-major n×2 matrix.
TEXT ·axpy2AVX2(SB), NOSPLIT, $0-40
	MOVQ         r+16(FP), SI
	MOVQ         x+24(FP), DI
	MOVQ         n+32(FP), CX
	VMOVUPD      v0+0(FP), X7 // v0 v1
	VINSERTF128  $1, X7, Y7, Y7

axpy2x4:
	CMPQ         CX, $4
	JLT          axpy2x1
	VMOVUPD      (SI), Y4
	VPERMPD      $0x50, Y4, Y5
	VPERMPD      $0xFA, Y4, Y6
	VMOVUPD      (DI), Y2
	VMOVUPD      32(DI), Y3
	VFNMADD231PD Y5, Y7, Y2
	VFNMADD231PD Y6, Y7, Y3
	VMOVUPD      Y2, (DI)
	VMOVUPD      Y3, 32(DI)
	ADDQ         $32, SI
	ADDQ         $64, DI
	SUBQ         $4, CX
	JMP          axpy2x4

axpy2x1:
	TESTQ        CX, CX
	JZ           axpy2done
	VMOVDDUP     (SI), X4
	VMOVUPD      (DI), X2
	VFNMADD231PD X4, X7, X2
	VMOVUPD      X2, (DI)
	ADDQ         $8, SI
	ADDQ         $16, DI
	DECQ         CX
	JMP          axpy2x1

axpy2done:
	VZEROUPPER
	RET
