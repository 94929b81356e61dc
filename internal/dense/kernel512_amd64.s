//go:build !purego

#include "textflag.h"
#include "kernel512_amd64.h"

// AVX-512 micro-kernels: as kernAVX2 (kernel_amd64.s), on tiles of 16
// columns, two of the packed 8-column slivers of B side by side.

// func kern12x16AVX512(k int, a, b, c *float64, ldc int)
//
// C[0:12][0:16] -= Σ_p A[r][p]·B[p][j] for two packed 6-row slivers of A (at a
// and a + 6k), two packed 8-column slivers of B (at b and b + 8k) and a
// row-major tile c with row stride ldc. Z0–Z23 hold the tile (row r in
// Z2r, Z2r+1), Z24 and Z25 the row of B, Z26 the broadcast entry of A.
// Each entry is summed in the order of p by fused multiply-adds and then
// subtracted, as in kernAVX2: the same results, bit for bit. k ≥ 1.
TEXT ·kern12x16AVX512(SB), NOSPLIT, $0-40
	MOVQ k+0(FP), CX
	MOVQ a+8(FP), SI
	MOVQ b+16(FP), DI
	MOVQ c+24(FP), DX
	MOVQ ldc+32(FP), R8
	SHLQ $3, R8
	LEAQ (CX)(CX*2), R10
	SHLQ $4, R10          // 6k entries, in bytes: the second sliver of A
	MOVQ CX, R11
	SHLQ $6, R11          // 8k entries, in bytes: the second sliver of B
	LEAQ (SI)(R10*1), R9
	LEAQ (DI)(R11*1), R11
	VPXORQ Z0, Z0, Z0
	VPXORQ Z1, Z1, Z1
	VPXORQ Z2, Z2, Z2
	VPXORQ Z3, Z3, Z3
	VPXORQ Z4, Z4, Z4
	VPXORQ Z5, Z5, Z5
	VPXORQ Z6, Z6, Z6
	VPXORQ Z7, Z7, Z7
	VPXORQ Z8, Z8, Z8
	VPXORQ Z9, Z9, Z9
	VPXORQ Z10, Z10, Z10
	VPXORQ Z11, Z11, Z11
	VPXORQ Z12, Z12, Z12
	VPXORQ Z13, Z13, Z13
	VPXORQ Z14, Z14, Z14
	VPXORQ Z15, Z15, Z15
	VPXORQ Z16, Z16, Z16
	VPXORQ Z17, Z17, Z17
	VPXORQ Z18, Z18, Z18
	VPXORQ Z19, Z19, Z19
	VPXORQ Z20, Z20, Z20
	VPXORQ Z21, Z21, Z21
	VPXORQ Z22, Z22, Z22
	VPXORQ Z23, Z23, Z23

loop:
	VMOVUPD (DI), Z24
	VMOVUPD (R11), Z25
	VBROADCASTSD 0(SI), Z26
	VFMADD231PD  Z24, Z26, Z0
	VFMADD231PD  Z25, Z26, Z1
	VBROADCASTSD 8(SI), Z26
	VFMADD231PD  Z24, Z26, Z2
	VFMADD231PD  Z25, Z26, Z3
	VBROADCASTSD 16(SI), Z26
	VFMADD231PD  Z24, Z26, Z4
	VFMADD231PD  Z25, Z26, Z5
	VBROADCASTSD 24(SI), Z26
	VFMADD231PD  Z24, Z26, Z6
	VFMADD231PD  Z25, Z26, Z7
	VBROADCASTSD 32(SI), Z26
	VFMADD231PD  Z24, Z26, Z8
	VFMADD231PD  Z25, Z26, Z9
	VBROADCASTSD 40(SI), Z26
	VFMADD231PD  Z24, Z26, Z10
	VFMADD231PD  Z25, Z26, Z11
	VBROADCASTSD 0(R9), Z26
	VFMADD231PD  Z24, Z26, Z12
	VFMADD231PD  Z25, Z26, Z13
	VBROADCASTSD 8(R9), Z26
	VFMADD231PD  Z24, Z26, Z14
	VFMADD231PD  Z25, Z26, Z15
	VBROADCASTSD 16(R9), Z26
	VFMADD231PD  Z24, Z26, Z16
	VFMADD231PD  Z25, Z26, Z17
	VBROADCASTSD 24(R9), Z26
	VFMADD231PD  Z24, Z26, Z18
	VFMADD231PD  Z25, Z26, Z19
	VBROADCASTSD 32(R9), Z26
	VFMADD231PD  Z24, Z26, Z20
	VFMADD231PD  Z25, Z26, Z21
	VBROADCASTSD 40(R9), Z26
	VFMADD231PD  Z24, Z26, Z22
	VFMADD231PD  Z25, Z26, Z23
	ADDQ $48, SI
	ADDQ $48, R9
	ADDQ $64, DI
	ADDQ $64, R11
	DECQ CX
	JNZ  loop

	SUBROW16(Z0, Z1)
	ADDQ    R8, DX
	SUBROW16(Z2, Z3)
	ADDQ    R8, DX
	SUBROW16(Z4, Z5)
	ADDQ    R8, DX
	SUBROW16(Z6, Z7)
	ADDQ    R8, DX
	SUBROW16(Z8, Z9)
	ADDQ    R8, DX
	SUBROW16(Z10, Z11)
	ADDQ    R8, DX
	SUBROW16(Z12, Z13)
	ADDQ    R8, DX
	SUBROW16(Z14, Z15)
	ADDQ    R8, DX
	SUBROW16(Z16, Z17)
	ADDQ    R8, DX
	SUBROW16(Z18, Z19)
	ADDQ    R8, DX
	SUBROW16(Z20, Z21)
	ADDQ    R8, DX
	SUBROW16(Z22, Z23)
	VZEROUPPER
	RET

// func kern6x16AVX512(k int, a, b, c *float64, ldc int)
//
// C[0:6][0:16] -= Σ_p a[6p+r]·B[p][j] for a packed 6-row sliver a, two
// packed 8-column slivers of B (at b and b + 8k) and a row-major tile c
// with row stride ldc. Z0–Z11 hold the tile (row r in Z2r, Z2r+1), Z24
// and Z25 the row of B, Z26 the broadcast entry of A.
// Each entry is summed in the order of p by fused multiply-adds and then
// subtracted, as in kernAVX2: the same results, bit for bit. k ≥ 1.
TEXT ·kern6x16AVX512(SB), NOSPLIT, $0-40
	MOVQ k+0(FP), CX
	MOVQ a+8(FP), SI
	MOVQ b+16(FP), DI
	MOVQ c+24(FP), DX
	MOVQ ldc+32(FP), R8
	SHLQ $3, R8
	LEAQ (CX)(CX*2), R10
	SHLQ $4, R10          // 6k entries, in bytes: the second sliver of A
	MOVQ CX, R11
	SHLQ $6, R11          // 8k entries, in bytes: the second sliver of B
	LEAQ (SI)(R10*1), R9
	LEAQ (DI)(R11*1), R11
	VPXORQ Z0, Z0, Z0
	VPXORQ Z1, Z1, Z1
	VPXORQ Z2, Z2, Z2
	VPXORQ Z3, Z3, Z3
	VPXORQ Z4, Z4, Z4
	VPXORQ Z5, Z5, Z5
	VPXORQ Z6, Z6, Z6
	VPXORQ Z7, Z7, Z7
	VPXORQ Z8, Z8, Z8
	VPXORQ Z9, Z9, Z9
	VPXORQ Z10, Z10, Z10
	VPXORQ Z11, Z11, Z11

loop:
	VMOVUPD (DI), Z24
	VMOVUPD (R11), Z25
	VBROADCASTSD 0(SI), Z26
	VFMADD231PD  Z24, Z26, Z0
	VFMADD231PD  Z25, Z26, Z1
	VBROADCASTSD 8(SI), Z26
	VFMADD231PD  Z24, Z26, Z2
	VFMADD231PD  Z25, Z26, Z3
	VBROADCASTSD 16(SI), Z26
	VFMADD231PD  Z24, Z26, Z4
	VFMADD231PD  Z25, Z26, Z5
	VBROADCASTSD 24(SI), Z26
	VFMADD231PD  Z24, Z26, Z6
	VFMADD231PD  Z25, Z26, Z7
	VBROADCASTSD 32(SI), Z26
	VFMADD231PD  Z24, Z26, Z8
	VFMADD231PD  Z25, Z26, Z9
	VBROADCASTSD 40(SI), Z26
	VFMADD231PD  Z24, Z26, Z10
	VFMADD231PD  Z25, Z26, Z11
	ADDQ $48, SI
	ADDQ $64, DI
	ADDQ $64, R11
	DECQ CX
	JNZ  loop

	SUBROW16(Z0, Z1)
	ADDQ    R8, DX
	SUBROW16(Z2, Z3)
	ADDQ    R8, DX
	SUBROW16(Z4, Z5)
	ADDQ    R8, DX
	SUBROW16(Z6, Z7)
	ADDQ    R8, DX
	SUBROW16(Z8, Z9)
	ADDQ    R8, DX
	SUBROW16(Z10, Z11)
	VZEROUPPER
	RET

// func kern12x8AVX512(k int, a, b, c *float64, ldc int)
//
// C[0:12][0:8] -= Σ_p A[r][p]·b[8p+j] for two packed 6-row slivers of A (at a
// and a + 6k), a packed 8-column sliver b and a row-major tile c with row
// stride ldc. Z0–Z11 hold the tile (row r in Zr), Z24 the row of b, Z26
// the broadcast entry of A.
// The same results, bit for bit, as kernAVX2. k ≥ 1.
TEXT ·kern12x8AVX512(SB), NOSPLIT, $0-40
	MOVQ k+0(FP), CX
	MOVQ a+8(FP), SI
	MOVQ b+16(FP), DI
	MOVQ c+24(FP), DX
	MOVQ ldc+32(FP), R8
	SHLQ $3, R8
	LEAQ (CX)(CX*2), R10
	SHLQ $4, R10          // 6k entries, in bytes: the second sliver of A
	LEAQ (SI)(R10*1), R9
	VPXORQ Z0, Z0, Z0
	VPXORQ Z1, Z1, Z1
	VPXORQ Z2, Z2, Z2
	VPXORQ Z3, Z3, Z3
	VPXORQ Z4, Z4, Z4
	VPXORQ Z5, Z5, Z5
	VPXORQ Z6, Z6, Z6
	VPXORQ Z7, Z7, Z7
	VPXORQ Z8, Z8, Z8
	VPXORQ Z9, Z9, Z9
	VPXORQ Z10, Z10, Z10
	VPXORQ Z11, Z11, Z11

loop:
	VMOVUPD (DI), Z24
	VFMADD231PD.BCST 0(SI), Z24, Z0
	VFMADD231PD.BCST 8(SI), Z24, Z1
	VFMADD231PD.BCST 16(SI), Z24, Z2
	VFMADD231PD.BCST 24(SI), Z24, Z3
	VFMADD231PD.BCST 32(SI), Z24, Z4
	VFMADD231PD.BCST 40(SI), Z24, Z5
	VFMADD231PD.BCST 0(R9), Z24, Z6
	VFMADD231PD.BCST 8(R9), Z24, Z7
	VFMADD231PD.BCST 16(R9), Z24, Z8
	VFMADD231PD.BCST 24(R9), Z24, Z9
	VFMADD231PD.BCST 32(R9), Z24, Z10
	VFMADD231PD.BCST 40(R9), Z24, Z11
	ADDQ $48, SI
	ADDQ $48, R9
	ADDQ $64, DI
	DECQ CX
	JNZ  loop

	SUBROW8(Z0)
	ADDQ    R8, DX
	SUBROW8(Z1)
	ADDQ    R8, DX
	SUBROW8(Z2)
	ADDQ    R8, DX
	SUBROW8(Z3)
	ADDQ    R8, DX
	SUBROW8(Z4)
	ADDQ    R8, DX
	SUBROW8(Z5)
	ADDQ    R8, DX
	SUBROW8(Z6)
	ADDQ    R8, DX
	SUBROW8(Z7)
	ADDQ    R8, DX
	SUBROW8(Z8)
	ADDQ    R8, DX
	SUBROW8(Z9)
	ADDQ    R8, DX
	SUBROW8(Z10)
	ADDQ    R8, DX
	SUBROW8(Z11)
	VZEROUPPER
	RET

// func kern6x8AVX512(k int, a, b, c *float64, ldc int)
//
// C[0:6][0:8] -= Σ_p a[6p+r]·b[8p+j], kernAVX2's tile in six registers
// Z0–Z5, Z24 the row of b, Z26 the broadcast entry of a.
// The same results, bit for bit, as kernAVX2. k ≥ 1.
TEXT ·kern6x8AVX512(SB), NOSPLIT, $0-40
	MOVQ k+0(FP), CX
	MOVQ a+8(FP), SI
	MOVQ b+16(FP), DI
	MOVQ c+24(FP), DX
	MOVQ ldc+32(FP), R8
	SHLQ $3, R8
	VPXORQ Z0, Z0, Z0
	VPXORQ Z1, Z1, Z1
	VPXORQ Z2, Z2, Z2
	VPXORQ Z3, Z3, Z3
	VPXORQ Z4, Z4, Z4
	VPXORQ Z5, Z5, Z5

loop:
	VMOVUPD (DI), Z24
	VFMADD231PD.BCST 0(SI), Z24, Z0
	VFMADD231PD.BCST 8(SI), Z24, Z1
	VFMADD231PD.BCST 16(SI), Z24, Z2
	VFMADD231PD.BCST 24(SI), Z24, Z3
	VFMADD231PD.BCST 32(SI), Z24, Z4
	VFMADD231PD.BCST 40(SI), Z24, Z5
	ADDQ $48, SI
	ADDQ $64, DI
	DECQ CX
	JNZ  loop

	SUBROW8(Z0)
	ADDQ    R8, DX
	SUBROW8(Z1)
	ADDQ    R8, DX
	SUBROW8(Z2)
	ADDQ    R8, DX
	SUBROW8(Z3)
	ADDQ    R8, DX
	SUBROW8(Z4)
	ADDQ    R8, DX
	SUBROW8(Z5)
	VZEROUPPER
	RET

// func rank1AVX512(a *float64, lda, rows, w int, inv float64) (pivot int)
//
// rank1AVX2 (kernel_amd64.s) for 2 ≤ w ≤ 9: the entries 1 … w−1 of a row
// in one masked register, u (the pivot row's) loaded once, and the next
// column's pivot read from the register rather than from the row just
// stored, two rows at a time, without branches. The same results, bit for
// bit.
TEXT ·rank1AVX512(SB), NOSPLIT, $0-48
	MOVQ         a+0(FP), SI
	MOVQ         lda+8(FP), R8
	SHLQ         $3, R8
	MOVQ         rows+16(FP), R9
	MOVQ         w+24(FP), CX
	DECQ         CX                // entries after the first, 1 … 8
	MOVQ         $1, R10
	SHLQ         CX, R10
	DECQ         R10
	KMOVQ        R10, K1           // their lanes
	VMOVUPD.Z    8(SI), K1, Z3     // u
	VMOVSD       inv+32(FP), X15
	MOVQ         $1, AX            // pivot
	MOVQ         $1, R11           // row
	VPCMPEQQ     Y13, Y13, Y13
	VPSRLQ       $1, Y13, Y13      // |x| mask
	MOVQ         $0xBFF0000000000000, R12
	MOVQ         R12, X14          // largest magnitude so far: −1 to start
	TESTQ        R9, R9
	JLE          done

	LEAQ         (SI)(R8*1), DI    // row 1
	MOVQ         R9, CX
	SHRQ         $1, CX            // pairs of rows
	JZ           one

pair:
	VMOVSD       (DI), X0
	VMOVSD       (DI)(R8*1), X5
	VMULSD       X15, X0, X0
	VMULSD       X15, X5, X5
	VMOVSD       X0, (DI)
	VMOVSD       X5, (DI)(R8*1)
	VBROADCASTSD X0, Z1            // l in every lane
	VBROADCASTSD X5, Z6
	VMOVUPD.Z    8(DI), K1, Z2
	VMOVUPD.Z    8(DI)(R8*1), K1, Z7
	VFNMADD231PD Z3, Z1, Z2
	VFNMADD231PD Z3, Z6, Z7
	VMOVUPD      Z2, K1, 8(DI)
	VMOVUPD      Z7, K1, 8(DI)(R8*1)
	VANDPD       X13, X2, X4
	VANDPD       X13, X7, X8
	VUCOMISD     X14, X4           // |a[r][1]| > largest? (false for NaN)
	CMOVQHI      R11, AX
	VMAXSD       X14, X4, X14
	INCQ         R11
	VUCOMISD     X14, X8
	CMOVQHI      R11, AX
	VMAXSD       X14, X8, X14
	INCQ         R11
	LEAQ         (DI)(R8*2), DI
	DECQ         CX
	JNZ          pair

one:
	TESTQ        $1, R9
	JZ           done
	VMOVSD       (DI), X0
	VMULSD       X15, X0, X0
	VMOVSD       X0, (DI)
	VBROADCASTSD X0, Z1
	VMOVUPD.Z    8(DI), K1, Z2
	VFNMADD231PD Z3, Z1, Z2
	VMOVUPD      Z2, K1, 8(DI)
	VANDPD       X13, X2, X4
	VUCOMISD     X14, X4
	CMOVQHI      R11, AX

done:
	VZEROUPPER
	MOVQ AX, pivot+40(FP)
	RET

// func swapAVX512(x, y *float64, n int)
//
// Exchanges x[i] and y[i] for i < n (n ≥ 1): sixteen entries per
// iteration, then eight, then the last ones under a mask.
TEXT ·swapAVX512(SB), NOSPLIT, $0-24
	MOVQ x+0(FP), SI
	MOVQ y+8(FP), DI
	MOVQ n+16(FP), CX

s16:
	CMPQ    CX, $16
	JLT     s8
	VMOVUPD (SI), Z0
	VMOVUPD 64(SI), Z1
	VMOVUPD (DI), Z2
	VMOVUPD 64(DI), Z3
	VMOVUPD Z2, (SI)
	VMOVUPD Z3, 64(SI)
	VMOVUPD Z0, (DI)
	VMOVUPD Z1, 64(DI)
	ADDQ    $128, SI
	ADDQ    $128, DI
	SUBQ    $16, CX
	JMP     s16

s8:
	CMPQ    CX, $8
	JLT     tail
	VMOVUPD (SI), Z0
	VMOVUPD (DI), Z2
	VMOVUPD Z2, (SI)
	VMOVUPD Z0, (DI)
	ADDQ    $64, SI
	ADDQ    $64, DI
	SUBQ    $8, CX

tail:
	TESTQ     CX, CX
	JZ        done
	MOVQ      $1, R10
	SHLQ      CX, R10
	DECQ      R10
	KMOVQ     R10, K1
	VMOVUPD.Z (SI), K1, Z0
	VMOVUPD.Z (DI), K1, Z2
	VMOVUPD   Z2, K1, (SI)
	VMOVUPD   Z0, K1, (DI)

done:
	VZEROUPPER
	RET

// func trsmLeafAVX512(m, nc int, l *float64, ldl int, b *float64, ldb int)
//
// Overwrites the m×nc block B (rows ldb apart) with L⁻¹B, L the unit lower
// triangle of the m×m block at l (rows ldl apart): for each strip of 8
// columns (the last one masked), row i held in Z0 takes
// b[i] −= l[i][j]·b[j] for j = 0, 1, …, i−1 in turn, skipping l[i][j] = 0,
// by one fused multiply-add each, rows j < i read back from the strip
// just written: the operations of trsmLower's axpys (axpyAVX2: y + (−v)·x
// fused) in their order, so the same results, bit for bit, without a call
// and a store per row pair. m ≥ 1, nc ≥ 1.
TEXT ·trsmLeafAVX512(SB), NOSPLIT, $0-48
	MOVQ m+0(FP), R12
	MOVQ nc+8(FP), CX
	MOVQ l+16(FP), SI
	MOVQ ldl+24(FP), R8
	SHLQ $3, R8
	MOVQ b+32(FP), DI
	MOVQ ldb+40(FP), R9
	SHLQ $3, R9
	VXORPD X2, X2, X2

strip:
	TESTQ CX, CX
	JLE   leafdone
	MOVQ  $0xff, R10
	CMPQ  CX, $8
	JGE   fullmask
	MOVQ  $1, R10
	SHLQ  CX, R10
	DECQ  R10

fullmask:
	KMOVQ R10, K1
	MOVQ  $1, R13          // i
	MOVQ  DI, R14
	ADDQ  R9, R14          // row i of the strip
	MOVQ  SI, R15
	ADDQ  R8, R15          // row i of L

row:
	CMPQ      R13, R12
	JGE       nextstrip
	VMOVUPD.Z (R14), K1, Z0
	XORQ      R11, R11     // j
	MOVQ      DI, BX       // row j of the strip

col:
	VMOVSD       (R15)(R11*8), X1
	VUCOMISD     X2, X1
	JNE          fma
	JPS          fma
	JMP          skip

fma:
	VBROADCASTSD X1, Z1
	VFNMADD231PD (BX), Z1, K1, Z0

skip:
	ADDQ R9, BX
	INCQ R11
	CMPQ R11, R13
	JLT  col
	VMOVUPD Z0, K1, (R14)
	ADDQ    R9, R14
	ADDQ    R8, R15
	INCQ    R13
	JMP     row

nextstrip:
	ADDQ $64, DI
	SUBQ $8, CX
	JMP  strip

leafdone:
	VZEROUPPER
	RET
