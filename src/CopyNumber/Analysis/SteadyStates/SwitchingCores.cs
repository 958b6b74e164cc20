using CopyNumber.Network;

namespace CopyNumber.Analysis.SteadyStates;

/// <summary>
/// Cores for the switching statistics (<see cref="ModeCore"/>) taken from the rate equations' stable steady
/// states when the model is deterministically bistable, so that they are fixed before any event is simulated
/// (docs/methods-analysis.md, "Switching statistics").
/// </summary>
/// <remarks>
/// Rule (our own): with stable steady states found (<see cref="SteadyStateSearch"/>), species i has the lowest
/// value x_lo and the highest x_hi over them, Δ = x_hi − x_lo; its low core is x ≤ ⌊x_lo + Δ/4⌋ and its high
/// core x ≥ ⌈x_hi − Δ/4⌉, so the middle half between the two states is the boundary region. A species is watched
/// only when at least one count lies strictly between the cores; species that barely differ between the states
/// are not. More than two stable states are reduced to the extreme two per species.
/// </remarks>
public static class SwitchingCores
{
    /// <summary>Largest species × reactions for which the steady states are searched on the way to a run (the search integrates ~18 starts).</summary>
    public const long SearchedEntries = 4096;

    /// <summary>Fraction of the distance between the two states that each core reaches towards the other.</summary>
    public const double CoreReach = 0.25;

    /// <summary>The cores from <paramref name="search"/>; empty unless it found two or more stable steady states.</summary>
    public static IReadOnlyList<ModeCore> From(SteadyStateSearchResult search, ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(search);
        ArgumentNullException.ThrowIfNull(network);
        if (!search.Multistable) return [];
        var cores = new List<ModeCore>();
        for (var i = 0; i < network.Species.Count; i++)
        {
            var low = search.Stable.Min(s => s.State[i]);
            var high = search.Stable.Max(s => s.State[i]);
            var reach = CoreReach * (high - low);
            var lowCore = Math.Floor(low + reach);
            var highCore = Math.Ceiling(high - reach);
            if (!(lowCore >= 0) || !(highCore - lowCore >= 2) || highCore > long.MaxValue / 2) continue;
            cores.Add(new ModeCore(i, network.Species[i], (long)lowCore, (long)highCore));
        }
        return cores;
    }

    /// <summary>
    /// The cores for <paramref name="network"/> from a search of its steady states, or empty when the network is
    /// too large to search on the way (<see cref="SearchedEntries"/>), has a cell cycle, or is not bistable.
    /// </summary>
    public static IReadOnlyList<ModeCore> Find(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        if (network.Cycle is not null || (long)network.Species.Count * network.Stoichiometry.ReactionCount > SearchedEntries) return [];
        return From(SteadyStateSearch.Find(network), network);
    }
}
