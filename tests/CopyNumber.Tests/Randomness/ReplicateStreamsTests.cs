using CopyNumber.Randomness;

namespace CopyNumber.Tests.Randomness;

public class ReplicateStreamsTests
{
    private static ulong[] Head(Xoshiro256StarStar rng, int length)
    {
        var values = new ulong[length];
        for (var i = 0; i < length; i++) values[i] = rng.NextUInt64();
        return values;
    }

    [Fact]
    public void The_same_seed_and_replicate_give_the_same_sequence()
    {
        foreach (var (seed, replicate) in new[] { (0UL, 0L), (1UL, 7L), (123456789UL, 999_999L), (ulong.MaxValue, long.MaxValue) })
            Assert.Equal(Head(ReplicateStreams.For(seed, replicate), 1000), Head(ReplicateStreams.For(seed, replicate), 1000));
    }

    [Fact]
    public void Different_replicates_and_seeds_give_different_sequences()
    {
        // 30 000 streams: if their opening pairs were random 128-bit values, a repeat would have
        // probability about 10^-30 (birthday bound), so any repeat means the derivation collides.
        var openings = new HashSet<(ulong, ulong)>();
        foreach (var seed in new[] { 0UL, 1UL, 0x5DEECE66DUL })
        for (var replicate = 0L; replicate < 10_000; replicate++)
        {
            var rng = ReplicateStreams.For(seed, replicate);
            Assert.True(openings.Add((rng.NextUInt64(), rng.NextUInt64())), $"seed {seed}, replicate {replicate} repeats another stream");
        }
    }

    [Fact]
    public void Neighbouring_replicates_are_uncorrelated()
    {
        // For independent U(0,1) sequences the sample correlation has standard error 1/√n (Fisher 1915);
        // tolerance 5 standard errors, over neighbouring pairs of replicates.
        const int n = 20_000;
        for (var replicate = 0L; replicate < 5; replicate++)
        {
            var a = ReplicateStreams.For(42, replicate);
            var b = ReplicateStreams.For(42, replicate + 1);
            double sa = 0, sb = 0, saa = 0, sbb = 0, sab = 0;
            for (var i = 0; i < n; i++)
            {
                var x = a.NextDouble();
                var y = b.NextDouble();
                sa += x; sb += y; saa += x * x; sbb += y * y; sab += x * y;
            }
            var covariance = sab / n - sa / n * (sb / n);
            var correlation = covariance / Math.Sqrt((saa / n - sa / n * (sa / n)) * (sbb / n - sb / n * (sb / n)));
            Assert.InRange(correlation, -5 / Math.Sqrt(n), 5 / Math.Sqrt(n));
        }
    }
}
