namespace CopyNumber.Stochastic;

/// <summary>
/// Critical reactions for tau-leaping (Cao, Gillespie &amp; Petzold 2005, J. Chem. Phys. 123:054104):
/// L_j = min over the species i that reaction j consumes (ν_ij &lt; 0) of ⌊x_i / |ν_ij|⌋ is how many more
/// times j can fire before exhausting one of them; j is critical when a_j &gt; 0 and L_j &lt; n_c.
/// Critical reactions do not leap; at most one of them fires in a leap.
/// </summary>
/// <remarks>
/// L_j is defined, as in the paper, by the state-change vector, so it covers rate laws too, which have no
/// reactant list: a rate law that consumes a scarce species is critical like a mass-action reaction.
/// </remarks>
internal sealed class CriticalReactions
{
    private readonly int[] _start;
    private readonly int[] _species;
    private readonly long[] _consumed;
    private readonly int _threshold;
    private readonly bool[] _bursty;

    public CriticalReactions(ReactionEffects effects, int threshold)
    {
        var reactions = effects.ChangeStart.Length - 1;
        _threshold = threshold;
        _start = new int[reactions + 1];
        var species = new List<int>();
        var consumed = new List<long>();
        for (var j = 0; j < reactions; j++)
        {
            _start[j] = species.Count;
            for (var e = effects.ChangeStart[j]; e < effects.ChangeStart[j + 1]; e++)
            {
                if (effects.ChangeAmount[e] >= 0) continue;
                species.Add(effects.ChangeSpecies[e]);
                consumed.Add(-effects.ChangeAmount[e]);
            }
        }
        _start[reactions] = species.Count;
        _species = species.ToArray();
        _consumed = consumed.ToArray();
        IsCritical = new bool[reactions];
        _bursty = new bool[reactions];
    }

    /// <summary>
    /// Reactions that make bursts are always critical (ours): the leap condition bounds the change of a leap
    /// from N's fixed entries, which a burst's random size escapes, so they fire one event at a time.
    /// </summary>
    public void MarkBursty(Network.BurstProducts bursts)
    {
        for (var j = 0; j < _bursty.Length; j++) _bursty[j] = bursts.Makes(j);
    }

    /// <summary>Per reaction, whether the last <see cref="Classify"/> found it critical.</summary>
    public bool[] IsCritical { get; }

    /// <summary>Marks the critical reactions of the state and returns a0c, the sum of their propensities.</summary>
    public double Classify(long[] counts, double[] propensities)
    {
        var total = 0.0;
        for (var j = 0; j < IsCritical.Length; j++)
        {
            var critical = propensities[j] > 0.0 && (_bursty[j] || FiringsLeft(j, counts) < _threshold);
            IsCritical[j] = critical;
            if (critical) total += propensities[j];
        }
        return total;
    }

    /// <summary>L_j; <see cref="long.MaxValue"/> for a reaction that consumes nothing.</summary>
    public long FiringsLeft(int reaction, long[] counts)
    {
        var left = long.MaxValue;
        for (var e = _start[reaction]; e < _start[reaction + 1]; e++)
            left = Math.Min(left, counts[_species[e]] / _consumed[e]);
        return left;
    }
}
