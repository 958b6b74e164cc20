using CopyNumber.Randomness;

namespace CopyNumber.Network;

/// <summary>
/// Parameters that vary from cell to cell (extrinsic variability; Elowitz, Levine, Siggia &amp; Swain 2002,
/// Science 297:1183; Swain, Elowitz &amp; Siggia 2002, PNAS 99:12795): each is drawn once per <i>draw</i> from a
/// named law with mean m (the declared value) and coefficient of variation cv. Immutable and shared.
/// </summary>
/// <remarks>
/// <para>Laws, each with mean m and standard deviation cv·m: <b>lognormal</b> (ln k normal with
/// σ² = ln(1 + cv²), μ = ln m − σ²/2); <b>gamma</b> (shape 1/cv², scale m·cv²; Marsaglia &amp; Tsang 2000,
/// ACM Trans. Math. Softw. 26:363); <b>uniform</b> on m·(1 ± √3·cv); <b>normal</b> truncated to k &gt; 0 (by
/// rejection; its mean and CV are those of the untruncated normal only when cv is small: at cv = 0.3 the
/// truncation removes 4·10⁻⁴ of the mass). Draws are independent between parameters (correlated draws are
/// not offered).</para>
/// <para>Nested design: replicates r = d·g … d·g + g − 1 share draw d (g replicates per draw, a divisor of
/// the block size, so a group never straddles a block or a shard). Draw d's values come from the stream
/// (seed ⊕ <see cref="StreamKey"/>, d) alone, so a replicate gets the same parameters on any thread, in any
/// shard and after any resumption.</para>
/// </remarks>
public sealed class ParameterVariability
{
    /// <summary>Mixed into the run seed for the draws' streams ("extrinsi"), so they never coincide with a replicate's stream.</summary>
    public const ulong StreamKey = 0x65787472696E7369;

    /// <summary>One varying parameter.</summary>
    public readonly record struct Varying(int Parameter, string Law, double Mean, double Cv);

    private readonly Varying[] _varying;

    internal ParameterVariability(IEnumerable<Varying> varying) => _varying = [.. varying];

    /// <summary>No parameter varies.</summary>
    public static ParameterVariability None { get; } = new([]);

    /// <summary>The varying parameters, in declaration order.</summary>
    public IReadOnlyList<Varying> All => _varying;

    /// <summary>True when some parameter varies.</summary>
    public bool Any => _varying.Length > 0;

    /// <summary>
    /// Writes draw <paramref name="draw"/>'s values of the varying parameters into <paramref name="parameters"/>
    /// (the others are left as they are). A function of (seed, draw) only.
    /// </summary>
    public void Draw(ulong seed, long draw, double[] parameters)
    {
        var rng = ReplicateStreams.For(seed ^ StreamKey, draw);
        foreach (var v in _varying) parameters[v.Parameter] = Sample(ref rng, v);
    }

    /// <summary>One value of <paramref name="v"/>'s law.</summary>
    public static double Sample(ref Xoshiro256StarStar rng, Varying v)
    {
        var (m, cv) = (v.Mean, v.Cv);
        if (cv == 0) return m;
        switch (v.Law)
        {
            case "lognormal":
            {
                var s2 = Math.Log(1 + cv * cv);
                return Math.Exp(Math.Log(m) - s2 / 2 + Math.Sqrt(s2) * GammaSampler.StandardNormal(ref rng));
            }
            case "gamma":
                return m * cv * cv * GammaSampler.Sample(ref rng, 1 / (cv * cv));
            case "uniform":
                return m * (1 + Math.Sqrt(3) * cv * (2 * rng.NextDouble() - 1));
            default:
                while (true)
                {
                    var k = m * (1 + cv * GammaSampler.StandardNormal(ref rng));
                    if (k > 0) return k;
                }
        }
    }
}
