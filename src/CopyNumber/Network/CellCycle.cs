using CopyNumber.Language;
using CopyNumber.Randomness;

namespace CopyNumber.Network;

/// <summary>How a cell's volume grows between divisions.</summary>
public enum CellGrowth
{
    /// <summary>V(a) = V₀·2^(a/T): the volume doubles over a cycle at a constant specific rate.</summary>
    Exponential,

    /// <summary>V(a) = V₀·(1 + a/T): the volume doubles over a cycle at a constant absolute rate.</summary>
    Linear,
}

/// <summary>How a dividing cell's molecules are shared between its two daughters.</summary>
public enum CellSplit
{
    /// <summary>Each molecule goes to the followed daughter with probability ½, independently (n ↦ Binomial(n, ½)).</summary>
    Binomial,

    /// <summary>As even as possible: n/2 for even n, ⌊n/2⌋ or ⌈n/2⌉ with probability ½ each for odd n.</summary>
    Halves,
}

/// <summary>
/// A cell that grows, copies its genes and divides, followed along one lineage (what a mother-machine
/// experiment sees). Immutable and shared. The volume V(t) is the model's <c>size</c> everywhere: at birth
/// V₀ = the declared size, at division 2·V₀; every mass-action propensity is c = k·V^(1−m) for a reaction of
/// order m (zeroth order grows with V, second order slows), and a <c>rate</c> law that names <c>size</c>
/// reads V(t). Between divisions the propensities change with time only through V, which is monotone, so
/// the thinned direct method bounds them exactly over a window (<see cref="TimeDependence"/>).
/// </summary>
/// <remarks>
/// The cycle enters compiled laws through two hidden parameters, <see cref="BirthName"/> (the time of the
/// current cycle's birth) and <see cref="LengthName"/> (its length T): V = V₀·2^((t − birth)/T) or
/// V₀·(1 + (t − birth)/T). A simulator sets them at each division; the rate equations keep T at its mean.
/// A cycle of random length has T ~ Gamma with the declared mean and CV, drawn at birth, so the volume
/// doubles in every cycle whatever its length (a timer that adapts the growth rate; ours, stated in
/// docs/methods.md "Growth and division").
/// </remarks>
public sealed class CellCycle
{
    /// <summary>The hidden parameter holding the time of the current cycle's birth (not a name a model can write).</summary>
    public const string BirthName = "cycle:birth";

    /// <summary>The hidden parameter holding the current cycle's length T (not a name a model can write).</summary>
    public const string LengthName = "cycle:length";

    internal CellCycle(CellGrowth growth, double meanLength, double lengthCv, int[] genes, double genePhase, CellSplit split,
        int birthSlot, int lengthSlot, SourcePosition position, IReadOnlyList<Diagnostic> warnings)
    {
        Growth = growth;
        MeanLength = meanLength;
        LengthCv = lengthCv;
        Genes = genes;
        GenePhase = genePhase;
        Split = split;
        BirthSlot = birthSlot;
        LengthSlot = lengthSlot;
        Position = position;
        Warnings = warnings;
    }

    /// <summary>The growth law between divisions.</summary>
    public CellGrowth Growth { get; }

    /// <summary>The mean cycle length, in the model's time unit.</summary>
    public double MeanLength { get; }

    /// <summary>The cycle length's coefficient of variation (gamma law); 0 for a fixed length.</summary>
    public double LengthCv { get; }

    /// <summary>The gene species, whose copies double at <see cref="GenePhase"/> and are shared exactly at division.</summary>
    public IReadOnlyList<int> Genes { get; }

    /// <summary>The fraction of the cycle at which the genes double, in [0, 1); NaN when there are no genes.</summary>
    public double GenePhase { get; }

    /// <summary>How the other species are shared at division.</summary>
    public CellSplit Split { get; private set; }

    /// <summary>The same cycle with another split (the control of the partitioning noise, Ensembles/PartitionControl).</summary>
    internal CellCycle WithSplit(CellSplit split)
    {
        var copy = (CellCycle)MemberwiseClone();
        copy.Split = split;
        return copy;
    }

    /// <summary>The parameter slot of <see cref="BirthName"/>.</summary>
    public int BirthSlot { get; }

    /// <summary>The parameter slot of <see cref="LengthName"/>.</summary>
    public int LengthSlot { get; }

    /// <summary>Where the <c>cycle</c> section starts, for messages.</summary>
    public SourcePosition Position { get; }

    /// <summary>What the compiler noticed but did not refuse: rate laws that ignore the growing volume.</summary>
    public IReadOnlyList<Diagnostic> Warnings { get; }

    /// <summary>One cycle length: the mean, or a gamma draw with the declared CV (Marsaglia &amp; Tsang 2000).</summary>
    public double DrawLength(ref Xoshiro256StarStar rng) =>
        LengthCv == 0 ? MeanLength : MeanLength * LengthCv * LengthCv * GammaSampler.Sample(ref rng, 1 / (LengthCv * LengthCv));

    /// <summary>The cycle in words, for <c>inspect</c>.</summary>
    public string Describe(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var length = LengthCv == 0 ? $"length {MeanLength:G6} (fixed)" : $"length gamma, mean {MeanLength:G6}, CV {LengthCv:G6}";
        var genes = Genes.Count == 0 ? "no gene species" : $"genes {string.Join(", ", Genes.Select(g => network.Species[g]))} double at phase {GenePhase:G6}";
        return $"{(Growth == CellGrowth.Exponential ? "exponential" : "linear")} growth from size {network.Size:G6} to twice it, {length}, {genes}, " +
               $"{(Split == CellSplit.Binomial ? "binomial" : "even (halves)")} split at division; one lineage followed " +
               "(division changes every count, so the conservation laws of N hold only between divisions)";
    }

    /// <summary>Whether species <paramref name="species"/> is one of the gene species.</summary>
    public bool IsGene(int species) => Genes.Contains(species);

    /// <summary>
    /// The cycle of the rate equations as timed changes (docs/methods.md "Growth and division"): the mean cell
    /// with the cycle's mean length T, whose gene species double at φ·T + k·T and whose species all halve at
    /// k·T (k ≥ 1; the mean of either split), when also the birth time moves on by T. At a tie the division
    /// applies first. Only the deterministic descriptions use them (<see cref="Timeline.ForRateEquations"/>);
    /// a simulator divides by its own draws.
    /// </summary>
    internal IReadOnlyList<ScheduledChange> MeanCellChanges(ReactionNetwork network)
    {
        var changes = new List<ScheduledChange>();
        var order = int.MaxValue - network.Species.Count - Genes.Count - 2;
        var length = MeanLength;
        changes.Add(new ScheduledChange(length, ScheduleTarget.Parameter, BirthSlot, BirthName, ScheduleOperation.Add,
            (_, _) => length, (_, _) => length) { Every = length, Order = order++ });
        for (var i = 0; i < network.Species.Count; i++)
        {
            if (network.Held[i]) continue;
            var species = i;
            changes.Add(new ScheduledChange(length, ScheduleTarget.Species, species, network.Species[species], ScheduleOperation.Set,
                (x, _) => x[species] / 2, (x, _) => x[species] / 2) { Every = length, Order = order++ });
        }
        foreach (var gene in Genes)
            changes.Add(new ScheduledChange(GenePhase * length, ScheduleTarget.Species, gene, network.Species[gene], ScheduleOperation.Set,
                (x, _) => 2 * x[gene], (x, _) => 2 * x[gene]) { Every = length, Order = order++ });
        return changes;
    }
}
