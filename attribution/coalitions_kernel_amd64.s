#include "textflag.h"

// func vectorKernel(kc int, a, b, c *float64, ldc int)
//
// Eight YMM accumulators hold the 4 × 8 block: Y(2i) columns 0–3 and
// Y(2i+1) columns 4–7 of row i. Each step loads the 8 B values of one
// record, broadcasts the 4 A values and issues 8 fused multiply-adds.
TEXT ·vectorKernel(SB), NOSPLIT, $0-40
	MOVQ kc+0(FP), CX
	MOVQ a+8(FP), SI
	MOVQ b+16(FP), DI
	MOVQ c+24(FP), DX
	MOVQ ldc+32(FP), BX
	SHLQ $3, BX
	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1
	VXORPD Y2, Y2, Y2
	VXORPD Y3, Y3, Y3
	VXORPD Y4, Y4, Y4
	VXORPD Y5, Y5, Y5
	VXORPD Y6, Y6, Y6
	VXORPD Y7, Y7, Y7

loop:
	VMOVUPD      (DI), Y8
	VMOVUPD      32(DI), Y9
	VBROADCASTSD (SI), Y10
	VFMADD231PD  Y8, Y10, Y0
	VFMADD231PD  Y9, Y10, Y1
	VBROADCASTSD 8(SI), Y11
	VFMADD231PD  Y8, Y11, Y2
	VFMADD231PD  Y9, Y11, Y3
	VBROADCASTSD 16(SI), Y12
	VFMADD231PD  Y8, Y12, Y4
	VFMADD231PD  Y9, Y12, Y5
	VBROADCASTSD 24(SI), Y13
	VFMADD231PD  Y8, Y13, Y6
	VFMADD231PD  Y9, Y13, Y7
	ADDQ         $32, SI
	ADDQ         $64, DI
	DECQ         CX
	JNZ          loop

	VADDPD  (DX), Y0, Y0
	VMOVUPD Y0, (DX)
	VADDPD  32(DX), Y1, Y1
	VMOVUPD Y1, 32(DX)
	ADDQ    BX, DX
	VADDPD  (DX), Y2, Y2
	VMOVUPD Y2, (DX)
	VADDPD  32(DX), Y3, Y3
	VMOVUPD Y3, 32(DX)
	ADDQ    BX, DX
	VADDPD  (DX), Y4, Y4
	VMOVUPD Y4, (DX)
	VADDPD  32(DX), Y5, Y5
	VMOVUPD Y5, 32(DX)
	ADDQ    BX, DX
	VADDPD  (DX), Y6, Y6
	VMOVUPD Y6, (DX)
	VADDPD  32(DX), Y7, Y7
	VMOVUPD Y7, 32(DX)
	VZEROUPPER
	RET
