using System.Runtime.CompilerServices;

namespace CopyNumber.Network;

/// <summary>
/// The species a network confines to the values 0 and 1 (a gene's state, a single channel), found from
/// its conservation laws, and for each reaction which of them it changes: what the per-replicate
/// transition count (<see cref="Ensembles.SwitchingStatistics"/>) counts.
/// </summary>
/// <remarks>
/// Rule: species i is two-state when a conservation law Σ c_k·x_k = T of the integer basis computed by
/// <see cref="StoichiometricStructure"/> has every c_k ≥ 0, c_i &gt; 0 and T &lt; 2·c_i: counts are never
/// negative, so c_i·x_i ≤ T and x_i ≤ 1 at every time (gene_off + gene_on = 1 confines both). The rule
/// uses the computed basis, so it is sufficient, not necessary: a confinement that only a combination of
/// basis laws shows is not found. A reaction changes a two-state species by ±1 whenever it can fire, so
/// each firing is one switch. The schedule may break a law (<c>gene_on = 1</c> without
/// <c>gene_off = 0</c>); the simulators check the laws after every change instant and the replicate's
/// count of that species is then left out (<see cref="Ensembles.SwitchingStatistics.Excluded"/>). Networks
/// with more than <see cref="AnalysedEntries"/> entries in N are not analysed (no two-state species).
/// Immutable; <see cref="Of"/> computes it once per network.
/// </remarks>
public sealed class TwoStateSpecies
{
    /// <summary>Largest species × reactions for which the conservation laws are searched for two-state species.</summary>
    public const long AnalysedEntries = 250_000;

    private static readonly ConditionalWeakTable<ReactionNetwork, TwoStateSpecies> Cache = new();

    private readonly int[] _species;
    private readonly ConservationLaw[] _laws;
    private readonly int[] _reactionStart;
    private readonly int[] _reactionSlots;

    private TwoStateSpecies(int[] species, ConservationLaw[] laws, int[] reactionStart, int[] reactionSlots)
    {
        _species = species;
        _laws = laws;
        _reactionStart = reactionStart;
        _reactionSlots = reactionSlots;
    }

    /// <summary>Indices of the two-state species, increasing; position s in this list is the species' slot.</summary>
    public IReadOnlyList<int> Species => _species;

    /// <summary>The law that confines the species in each slot (totals at the initial counts).</summary>
    public IReadOnlyList<ConservationLaw> Laws => _laws;

    /// <summary>Number of two-state species.</summary>
    public int Count => _species.Length;

    /// <summary>True when <paramref name="reaction"/> changes some two-state species.</summary>
    public bool ChangedBy(int reaction) => _reactionStart[reaction + 1] > _reactionStart[reaction];

    /// <summary>The slots of the two-state species <paramref name="reaction"/> changes.</summary>
    public ReadOnlySpan<int> SlotsChangedBy(int reaction) =>
        _reactionSlots.AsSpan(_reactionStart[reaction], _reactionStart[reaction + 1] - _reactionStart[reaction]);

    /// <summary>The two-state species of <paramref name="network"/>, computed once per network.</summary>
    public static TwoStateSpecies Of(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        return Cache.GetValue(network, Find);
    }

    private static TwoStateSpecies Find(ReactionNetwork network)
    {
        var n = network.Stoichiometry;
        var species = new List<int>();
        var laws = new List<ConservationLaw>();
        // x_i(0) ≤ 1 is necessary; only then is the exact analysis worth its cost. The exact elimination
        // grows faster than species × reactions, so beyond AnalysedEntries no species is taken as two-state
        // (the rule is sufficient, not necessary): a 30 000-reaction chain otherwise ran out of memory here.
        // A cell cycle doubles genes and splits molecules at division, which keeps no conservation law.
        if (network.Cycle is null && network.InitialCounts.Any(c => c <= 1) && (long)n.SpeciesCount * n.ReactionCount <= AnalysedEntries)
        {
            StoichiometricStructure structure;
            try
            {
                structure = StoichiometricStructure.Analyze(n, network.InitialCounts);
            }
            catch (OverflowException)
            {
                // Laws whose coefficients overflow 64 bits confine nothing to {0, 1} in practice.
                return new TwoStateSpecies([], [], new int[n.ReactionCount + 1], []);
            }
            for (var i = 0; i < n.SpeciesCount; i++)
            {
                if (network.InitialCounts[i] > 1) continue;
                var law = structure.ConservationLaws.FirstOrDefault(l =>
                    l.Coefficients[i] > 0 && l.Coefficients.All(c => c >= 0) && l.Total / 2 < l.Coefficients[i]);
                if (law is null) continue;
                species.Add(i);
                laws.Add(law);
            }
        }
        var slotOf = new int[n.SpeciesCount];
        Array.Fill(slotOf, -1);
        for (var s = 0; s < species.Count; s++) slotOf[species[s]] = s;
        var start = new int[n.ReactionCount + 1];
        var slots = new List<int>();
        for (var j = 0; j < n.ReactionCount; j++)
        {
            start[j] = slots.Count;
            var changed = n.ChangedSpecies(j);
            foreach (var i in changed)
                if (slotOf[i] >= 0) slots.Add(slotOf[i]);
        }
        start[n.ReactionCount] = slots.Count;
        return new TwoStateSpecies(species.ToArray(), laws.ToArray(), start, slots.ToArray());
    }
}
