/*
 * dgetrf_rate: the rate of a dense LU factorisation with partial pivoting
 * (LAPACK dgetrf as shipped in OpenBLAS) on this machine, for the limit
 * column of scripts/solver-bench.sh.
 *
 *   cc -O2 -o dgetrf_rate dgetrf_rate.c -lopenblas
 *   ./dgetrf_rate THREADS [N...]
 *
 * For each N (default 1000 1600 2000 3000) it factors a random N×N matrix
 * five times after one warm-up and prints "N THREADS GFLOP/s" with the
 * fastest run, counting 2/3 N^3 flops.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

extern void openblas_set_num_threads(int);
extern void dgetrf_(const int *m, const int *n, double *a, const int *lda, int *ipiv, int *info);

static double now(void) {
	struct timespec ts;
	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

int main(int argc, char **argv) {
	if (argc < 2) {
		fprintf(stderr, "usage: dgetrf_rate THREADS [N...]\n");
		return 2;
	}
	int threads = atoi(argv[1]);
	if (threads < 1) {
		fprintf(stderr, "dgetrf_rate: bad thread count %s\n", argv[1]);
		return 2;
	}
	openblas_set_num_threads(threads);
	int defaults[] = {1000, 1600, 2000, 3000};
	int count = argc > 2 ? argc - 2 : 4;
	unsigned long long state = 88172645463325252ULL;
	for (int k = 0; k < count; k++) {
		int n = argc > 2 ? atoi(argv[k + 2]) : defaults[k];
		if (n < 1) {
			fprintf(stderr, "dgetrf_rate: bad size\n");
			return 2;
		}
		size_t nn = (size_t)n * n;
		double *orig = malloc(nn * sizeof *orig), *a = malloc(nn * sizeof *a);
		int *ipiv = malloc(n * sizeof *ipiv);
		if (!orig || !a || !ipiv) {
			fprintf(stderr, "dgetrf_rate: out of memory\n");
			return 1;
		}
		for (size_t i = 0; i < nn; i++) { /* xorshift64, uniform in [-1, 1) */
			state ^= state << 13;
			state ^= state >> 7;
			state ^= state << 17;
			orig[i] = (double)(state >> 11) / 4503599627370496.0 - 1.0;
		}
		double best = 1e300;
		for (int r = 0; r < 6; r++) {
			memcpy(a, orig, nn * sizeof *a);
			int info;
			double t = now();
			dgetrf_(&n, &n, a, &n, ipiv, &info);
			t = now() - t;
			if (info != 0) {
				fprintf(stderr, "dgetrf_rate: dgetrf info %d\n", info);
				return 1;
			}
			if (r > 0 && t < best)
				best = t;
		}
		printf("%d %d %.2f\n", n, threads, 2.0 / 3.0 * n * (double)n * n / best / 1e9);
		free(orig);
		free(a);
		free(ipiv);
	}
	return 0;
}
