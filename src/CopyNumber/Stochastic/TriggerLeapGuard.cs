using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// Tau-leaping's rule for state-triggered changes: a leap is taken only when no trigger's condition could
/// change value within it; otherwise the simulator takes exact steps, which check the conditions after
/// every event (<see cref="TriggerWatch"/>).
/// </summary>
/// <remarks>
/// The rule (ours). Over a leap of length τ each species i the condition reads changes by
/// Σ_j ν_ij K_j with K_j ~ Poisson(a_j τ): mean m_i = Σ_j ν_ij a_j τ, variance v_i = Σ_j ν_ij² a_j τ.
/// Its range is taken as the box [x_i + min(0, m_i − 4√v_i), x_i + max(0, m_i + 4√v_i)], widened
/// outward to whole counts (so it always includes the count next to x_i in the direction of drift
/// whenever any reaction that changes i can fire). The condition is evaluated at every corner of the
/// box (the other species at their current counts); if any corner's value differs from the current
/// one, the leap could cross and exact steps are taken instead. For a condition monotone in each
/// species it reads — a threshold comparison of a sum or difference of counts, the form of SBML
/// events and of the Discrete Stochastic Models Test Suite — a crossing inside the box shows at a
/// corner, so the rule misses only excursions beyond 4 standard deviations (probability below 10⁻⁴ per
/// species and leap, by the normal approximation to the Poisson sum; Chebyshev's bound 1/16 holds
/// whatever the distribution). A condition that is not monotone (e.g. <c>X == 5</c>) may be crossed
/// inside the box unseen; a condition reading more than <see cref="MaxCornerSpecies"/> species always
/// takes exact steps. After every leap taken the conditions are evaluated on the new state, so a
/// crossing the rule missed still fires, at the leap's end.
/// </remarks>
internal sealed class TriggerLeapGuard
{
    /// <summary>Standard deviations of a species' change over a leap that the box spans on each side of its mean.</summary>
    public const double Spread = 4.0;

    /// <summary>Most species a condition may read for the corner test (2^8 = 256 corners); beyond, exact steps.</summary>
    public const int MaxCornerSpecies = 8;

    private readonly StateTrigger[] _triggers;
    private readonly int[][] _read;                 // per trigger, the species its condition reads
    private readonly int[] _species;                // every species some condition reads
    private readonly int[] _changeStart;            // per entry of _species: its (reaction, ν) list
    private readonly int[] _changeReaction;
    private readonly double[] _changeAmount;
    private readonly long[] _low;
    private readonly long[] _high;
    private readonly long[] _corner;

    public TriggerLeapGuard(ReactionNetwork network)
    {
        _triggers = [.. network.Triggers];
        var speciesCount = network.Species.Count;
        _read = _triggers.Select(t => t.SpeciesRead?.ToArray() ?? Enumerable.Range(0, speciesCount).ToArray()).ToArray();
        _species = _read.SelectMany(r => r).Distinct().Order().ToArray();
        var stoichiometry = network.Stoichiometry;
        var changes = new List<(int Reaction, double Amount)>[speciesCount];
        foreach (var i in _species) changes[i] = [];
        for (var j = 0; j < stoichiometry.ReactionCount; j++)
        {
            var species = stoichiometry.ChangedSpecies(j);
            var amounts = stoichiometry.Changes(j);
            for (var e = 0; e < species.Length; e++)
                changes[species[e]]?.Add((j, amounts[e]));
        }
        _changeStart = new int[_species.Length + 1];
        var flat = new List<(int Reaction, double Amount)>();
        for (var s = 0; s < _species.Length; s++)
        {
            flat.AddRange(changes[_species[s]]);
            _changeStart[s + 1] = flat.Count;
        }
        _changeReaction = flat.Select(c => c.Reaction).ToArray();
        _changeAmount = flat.Select(c => c.Amount).ToArray();
        _low = new long[speciesCount];
        _high = new long[speciesCount];
        _corner = new long[speciesCount];
    }

    /// <summary>True when the network has triggers for the rule to watch.</summary>
    public bool Any => _triggers.Length > 0;

    /// <summary>True when some trigger's condition could change value within a leap of <paramref name="tau"/> from the current state.</summary>
    /// <param name="counts">The current counts.</param>
    /// <param name="parameters">The parameter values in force.</param>
    /// <param name="propensity">a_j at the current state.</param>
    /// <param name="tau">The leap's length, in model time units.</param>
    public bool MayCross(long[] counts, double[] parameters, double[] propensity, double tau)
    {
        if (_triggers.Length == 0) return false;
        for (var s = 0; s < _species.Length; s++)
        {
            double mean = 0, variance = 0;
            for (var e = _changeStart[s]; e < _changeStart[s + 1]; e++)
            {
                var expected = propensity[_changeReaction[e]] * tau;
                var nu = _changeAmount[e];
                mean += nu * expected;
                variance += nu * nu * expected;
            }
            var x = counts[_species[s]];
            var spread = Spread * Math.Sqrt(variance);
            _low[_species[s]] = Math.Max(0, (long)Math.Floor(Math.Min(x, x + mean - spread)));
            _high[_species[s]] = (long)Math.Min(FiringProgram.CountLimit, Math.Ceiling(Math.Max(x, x + mean + spread)));
        }
        for (var t = 0; t < _triggers.Length; t++)
        {
            var read = _read[t];
            if (read.Length > MaxCornerSpecies) return true;
            var now = StateTrigger.Holds(_triggers[t].OnCounts(counts, parameters));
            Array.Copy(counts, _corner, counts.Length);
            for (var corner = 0; corner < 1 << read.Length; corner++)
            {
                for (var r = 0; r < read.Length; r++)
                    _corner[read[r]] = (corner >> r & 1) == 0 ? _low[read[r]] : _high[read[r]];
                if (StateTrigger.Holds(_triggers[t].OnCounts(_corner, parameters)) != now) return true;
            }
        }
        return false;
    }
}
