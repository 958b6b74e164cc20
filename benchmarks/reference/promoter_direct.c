/*
 * Reference point for docs/performance.md, not part of CopyNumber: Gillespie's direct method (Gillespie
 * 1977, J. Phys. Chem. 81:2340) hand-specialised in C to the promoter model of scenarios/promoter_switch.cnet
 * (6 reactions, fixed rate constants, xoshiro256** numbers, exponential draw by log), 200 replicates to
 * t = 2000. It prints events per CPU second of its thread, so it can be run beside the C# benchmarks on a
 * shared machine and the two compared as a ratio, and events per wall second. An optional argument sets the
 * number of replicates. promoter_direct_ziggurat.c is the same loop with a ziggurat exponential.
 *
 *   gcc -O2 -o /tmp/promoter_direct benchmarks/reference/promoter_direct.c -lm && /tmp/promoter_direct
 */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

static uint64_t s[4] = {1, 2, 3, 4};
static inline uint64_t rotl(uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }
static inline uint64_t next(void)
{
    uint64_t r = rotl(s[1] * 5, 7) * 9, t = s[1] << 17;
    s[2] ^= s[0]; s[3] ^= s[1]; s[1] ^= s[2]; s[0] ^= s[3]; s[2] ^= t; s[3] = rotl(s[3], 45);
    return r;
}
static inline double uniform(void) { return (next() >> 11) * (1.0 / 9007199254740992.0); }
static inline double open_uniform(void) { return ((next() >> 11) + 1) * (1.0 / 9007199254740992.0); }

int main(int argc, char **argv)
{
    const double kon = 0.05, koff = 0.05, ktx = 6, ktl = 0.2, dm = 0.1, dp = 0.02;
    int replicates = argc > 1 ? atoi(argv[1]) : 200;
    long total = 0;
    struct timespec a, b, wa, wb;
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &a);
    clock_gettime(CLOCK_MONOTONIC, &wa);
    for (int rep = 0; rep < replicates; rep++) {
        long off = 1, on = 0, m = 0, p = 0;
        double q[6], t = 0;
        q[0] = kon * off; q[1] = koff * on; q[2] = ktx * on; q[3] = ktl * m; q[4] = dm * m; q[5] = dp * p;
        double a0 = q[0] + q[1] + q[2] + q[3] + q[4] + q[5];
        for (;;) {
            t += -log(open_uniform()) / a0;
            if (t > 2000) break;
            double r = uniform() * a0;
            int j = 0;
            while (j < 5 && (r -= q[j]) >= 0) j++;
            switch (j) {
            case 0: off--; on++; q[0] = kon * off; q[1] = koff * on; q[2] = ktx * on; break;
            case 1: off++; on--; q[0] = kon * off; q[1] = koff * on; q[2] = ktx * on; break;
            case 2: m++; q[3] = ktl * m; q[4] = dm * m; break;
            case 3: p++; q[5] = dp * p; break;
            case 4: m--; q[3] = ktl * m; q[4] = dm * m; break;
            case 5: p--; q[5] = dp * p; break;
            }
            a0 = q[0] + q[1] + q[2] + q[3] + q[4] + q[5];
            total++;
        }
    }
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &b);
    clock_gettime(CLOCK_MONOTONIC, &wb);
    double seconds = (b.tv_sec - a.tv_sec) + 1e-9 * (b.tv_nsec - a.tv_nsec);
    double wall = (wb.tv_sec - wa.tv_sec) + 1e-9 * (wb.tv_nsec - wa.tv_nsec);
    printf("%ld events in %.3f CPU s (%.3f wall s): %.2f M events per CPU second, %.2f M per wall second\n",
           total, seconds, wall, total / seconds / 1e6, total / wall / 1e6);
    return 0;
}
