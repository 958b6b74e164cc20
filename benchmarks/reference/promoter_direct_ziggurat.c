/*
 * Reference point for docs/performance.md, not part of CopyNumber: the loop of promoter_direct.c (same model,
 * same xoshiro256** stream, same linear selection and propensity updates), with the exponential waiting
 * time drawn by an exact ziggurat (Marsaglia & Tsang 2000, J. Stat. Softw. 5(8)) instead of -log(u), as
 * CopyNumber's engine does (src/CopyNumber/Randomness/ZigguratExponential.cs): 256 layers, the layer
 * from bits 0-7 of one 64-bit draw, the abscissa from its top 53 bits, exact wedges (rejection against
 * exp(-x)) and tail (r + a fresh variate). The tables are solved for at start-up by bisection on r, as
 * in the engine. Prints events per CPU second of its thread and per wall second.
 *
 *   gcc -O3 -march=native -o /tmp/promoter_zig benchmarks/reference/promoter_direct_ziggurat.c -lm && /tmp/promoter_zig
 *   (an optional argument sets the number of replicates, default 200, each to t = 2000)
 */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define LAYERS 256

static uint64_t s[4] = {1, 2, 3, 4};
static inline uint64_t rotl(uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }
static inline uint64_t next(void)
{
    uint64_t r = rotl(s[1] * 5, 7) * 9, t = s[1] << 17;
    s[2] ^= s[0]; s[3] ^= s[1]; s[1] ^= s[2]; s[0] ^= s[3]; s[2] ^= t; s[3] = rotl(s[3], 45);
    return r;
}
static inline double uniform(void) { return (next() >> 11) * (1.0 / 9007199254740992.0); }

static double edge[LAYERS + 1], height[LAYERS + 1], width[LAYERS], tail_start;

/* Fills edge[] from r by x_{i+1} = -ln(e^{-x_i} + v/x_i); returns e^{-x_255} + v/x_255 (1 when r is right). */
static double layers_from(double r)
{
    double v = (r + 1) * exp(-r), top = 0;
    edge[0] = v / exp(-r);
    edge[1] = r;
    for (int i = 1; i < LAYERS; i++) {
        top = exp(-edge[i]) + v / edge[i];
        if (top >= 1) return top;
        if (i + 1 < LAYERS) edge[i + 1] = -log(top);
    }
    edge[LAYERS] = 0;
    return top;
}

static void build_tables(void)
{
    double low = 1, high = 20;
    for (;;) {
        double mid = 0.5 * (low + high);
        if (mid <= low || mid >= high) break;
        if (layers_from(mid) >= 1) low = mid; else high = mid;
    }
    tail_start = high;
    layers_from(high);
    for (int i = 1; i < LAYERS; i++) height[i] = exp(-edge[i]);
    height[0] = 0;
    height[LAYERS] = 1;
    for (int i = 0; i < LAYERS; i++) width[i] = edge[i] * (1.0 / 9007199254740992.0);
}

static __attribute__((noinline)) double exponential_outside(int layer, double x)
{
    double shift = 0;
    for (;;) {
        if (layer == 0) shift += tail_start;
        else if (height[layer] + uniform() * (height[layer + 1] - height[layer]) < exp(-x)) return shift + x;
        uint64_t b = next();
        layer = (int)(b & (LAYERS - 1));
        x = (b >> 11) * width[layer];
        if (x < edge[layer + 1]) return shift + x;
    }
}

static inline double exponential(void)
{
    uint64_t b = next();
    int layer = (int)(b & (LAYERS - 1));
    double x = (b >> 11) * width[layer];
    if (__builtin_expect(x < edge[layer + 1], 1)) return x;
    return exponential_outside(layer, x);
}

int main(int argc, char **argv)
{
    const double kon = 0.05, koff = 0.05, ktx = 6, ktl = 0.2, dm = 0.1, dp = 0.02;
    int replicates = argc > 1 ? atoi(argv[1]) : 200;
    build_tables();
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
            t += exponential() / a0;
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
    printf("r = %.17g; %ld events in %.3f CPU s (%.3f wall s): %.2f M events per CPU second, %.2f M per wall second\n",
           tail_start, total, seconds, wall, total / seconds / 1e6, total / wall / 1e6);
    return 0;
}
