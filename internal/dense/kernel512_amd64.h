// Shared by the AVX-512 micro-kernels (kernel512_amd64.s, kernelu_amd64.s):
// the tile's row held in registers subtracted from the row of C at DX,
// C[r][j] -= Σ, as kernAVX2 does, so every path gives the same bits.

// SUBROW16 subtracts the 16 entries in lo (columns 0–7) and hi (8–15)
// from the row at DX. Z24 and Z25 are scratch.
#define SUBROW16(lo, hi) \
	VMOVUPD (DX), Z24 \
	VMOVUPD 64(DX), Z25 \
	VSUBPD  lo, Z24, Z24 \
	VSUBPD  hi, Z25, Z25 \
	VMOVUPD Z24, (DX) \
	VMOVUPD Z25, 64(DX)

// SUBROW8 subtracts the 8 entries in v from the row at DX. Z24 is scratch.
#define SUBROW8(v) \
	VMOVUPD (DX), Z24 \
	VSUBPD  v, Z24, Z24 \
	VMOVUPD Z24, (DX)
