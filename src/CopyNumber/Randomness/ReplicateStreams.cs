namespace CopyNumber.Randomness;

/// <summary>
/// Derives each replicate's generator from (run seed, replicate index) alone, so replicate r follows
/// the same trajectory whatever the thread count, the order replicates are scheduled in, or the shard
/// that runs it. The two 64-bit inputs are mixed by two rounds of SplitMix64 into one seed; the
/// generator is then seeded as <see cref="Xoshiro256StarStar(ulong)"/> documents.
/// </summary>
public static class ReplicateStreams
{
    /// <summary>The generator for replicate <paramref name="replicate"/> (0-based) of a run with <paramref name="seed"/>.</summary>
    public static Xoshiro256StarStar For(ulong seed, long replicate)
    {
        var state = seed;
        var mixedSeed = Xoshiro256StarStar.SplitMix64(ref state);
        state = mixedSeed ^ (ulong)replicate;
        var streamSeed = Xoshiro256StarStar.SplitMix64(ref state) ^ Xoshiro256StarStar.SplitMix64(ref state);
        return new Xoshiro256StarStar(streamSeed);
    }
}
