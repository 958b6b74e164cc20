using CopyNumber.Kinetics;

namespace CopyNumber.Network;

/// <summary>
/// Products made in bursts: <c>0 -> burst(b) mrna</c> makes B copies per firing, B geometric on 0, 1, 2, …
/// with mean b, P(B = k) = (1 − q)·q^k with q = b/(1 + b) (variance b(1 + b), E[B²] = b(1 + 2b)), the law
/// under which a bursty birth–death process has a negative binomial stationary law (Friedman, Cai &amp; Xie
/// 2006, Phys. Rev. Lett. 97:168302; Shahrezaei &amp; Swain 2008, PNAS 105:17256). Immutable and shared.
/// </summary>
/// <remarks>
/// In N a burst stands as +1 (one copy, so the structure — conservation laws, the count lattice, the
/// dependency graph — sees that the reaction changes the species by any whole number); every consumer adds
/// the rest: the simulators draw B and add B − 1 (the count was just raised by 1, so it never goes below 0),
/// the rate equations add (b − 1)·v_j, and the linear noise approximation adds the burst's second moment.
/// </remarks>
public sealed class BurstProducts
{
    private readonly Burst[] _bursts;
    private readonly int[] _start;

    /// <summary>One burst: reaction, species, and the mean b as a law of the parameters.</summary>
    public readonly record struct Burst(int Reaction, int Species, StateLaw Mean);

    internal BurstProducts(int reactions, IEnumerable<Burst> bursts)
    {
        _bursts = bursts.OrderBy(b => b.Reaction).ToArray();
        _start = new int[reactions + 1];
        foreach (var b in _bursts) _start[b.Reaction + 1]++;
        for (var j = 0; j < reactions; j++) _start[j + 1] += _start[j];
    }

    /// <summary>No bursts.</summary>
    public static BurstProducts None(int reactions) => new(reactions, []);

    /// <summary>True when some reaction makes a burst.</summary>
    public bool Any => _bursts.Length > 0;

    /// <summary>Every burst, in reaction order.</summary>
    public IReadOnlyList<Burst> All => _bursts;

    /// <summary>Whether reaction <paramref name="reaction"/> makes a burst.</summary>
    public bool Makes(int reaction) => _start[reaction + 1] > _start[reaction];

    /// <summary>The indices into <see cref="All"/> of reaction <paramref name="reaction"/>'s bursts.</summary>
    public (int Start, int End) Of(int reaction) => (_start[reaction], _start[reaction + 1]);

    /// <summary>The mean burst sizes b at <paramref name="parameters"/>, indexed like <see cref="All"/>.</summary>
    public void Means(double[] parameters, double[] means)
    {
        for (var k = 0; k < _bursts.Length; k++) means[k] = _bursts[k].Mean([], parameters);
    }

    /// <summary>E[B] and E[B²] of a geometric burst of mean <paramref name="mean"/> (E[B²] = b + 2b²).</summary>
    public static (double First, double Second) Moments(double mean) => (mean, mean + 2 * mean * mean);
}
