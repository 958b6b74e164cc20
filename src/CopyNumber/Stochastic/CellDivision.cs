using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// One simulator's cell cycle along a lineage: when the genes double and when the cell divides, and the
/// division itself (docs/methods.md "Growth and division"). Per thread, like <see cref="SimulatorState"/>.
/// </summary>
/// <remarks>
/// Its draws (cycle lengths, partitions) come from a stream seeded from one draw of the replicate's own
/// stream at the replicate's start, so a replicate's divisions are the same on any thread, in any shard and
/// after any resumption, and a network without a cycle draws nothing more than before. At division the
/// followed daughter keeps, of each species that is not a gene, Binomial(n, ½) molecules (each molecule
/// independently; Huh &amp; Paulsson 2011, Nat. Genet. 43:95) or as even a share as can be (n/2, or ⌊n/2⌋ and
/// ⌈n/2⌉ with probability ½ each); of the gene copies, exactly half of their total, a uniformly chosen
/// subset of the copies (so a gene doubled in two states passes on one copy of either), by selection
/// sampling (Knuth, TAOCP vol. 2, Algorithm 3.4.2 S).
/// </remarks>
internal sealed class CellDivision(CellCycle cycle)
{
    private Xoshiro256StarStar _stream;
    private double _birth;
    private double _length;
    private double _doubling;

    /// <summary>The time of the next cycle event: the genes' doubling or the division.</summary>
    public double NextTime => Math.Min(_doubling, _birth + _length);

    /// <summary>Divisions since the replicate's start.</summary>
    public long Divisions { get; private set; }

    /// <summary>The current cycle's birth time.</summary>
    public double Birth => _birth;

    /// <summary>The current cycle's length.</summary>
    public double Length => _length;

    /// <summary>
    /// A factor on every drawn cycle length: 1 for the lineage a mother machine follows; for the population
    /// snapshot's ancestral lineage, the scale that turns the gamma law f into 2e^(−Λτ)f(τ)
    /// (<see cref="Network.BalancedGrowth.AncestralScale"/>). Set before <see cref="Start"/>.
    /// </summary>
    public double LengthScale { get; set; } = 1.0;

    /// <summary>Seeds the cycle's stream from one draw of <paramref name="rng"/> and starts the first cycle at t = 0 (a newborn cell).</summary>
    public void Start(ref Xoshiro256StarStar rng, SimulatorState state)
    {
        _stream = new Xoshiro256StarStar(rng.NextUInt64());
        Divisions = 0;
        NewCycle(0.0, state);
    }

    /// <summary>Carries out the cycle event due at <paramref name="time"/> (= <see cref="NextTime"/>).</summary>
    public void Apply(double time, SimulatorState state)
    {
        if (time >= _doubling)
        {
            foreach (var g in cycle.Genes) state.Counts[g] = checked(2 * state.Counts[g]);
            _doubling = double.PositiveInfinity;
            return;
        }
        Divide(state.Counts, state.Network);
        Divisions++;
        NewCycle(time, state);
    }

    private void NewCycle(double birth, SimulatorState state)
    {
        _birth = birth;
        _length = cycle.DrawLength(ref _stream) * LengthScale;
        _doubling = cycle.Genes.Count > 0 ? birth + cycle.GenePhase * _length : double.PositiveInfinity;
        state.Parameters[cycle.BirthSlot] = birth;
        state.Parameters[cycle.LengthSlot] = _length;
    }

    private void Divide(long[] counts, ReactionNetwork network)
    {
        var genes = 0L;
        for (var i = 0; i < counts.Length; i++)
        {
            if (network.Held[i]) continue;
            if (cycle.IsGene(i))
            {
                genes += counts[i];
                continue;
            }
            counts[i] = cycle.Split == CellSplit.Binomial ? BinomialSampler.Sample(ref _stream, counts[i], 0.5) : Half(counts[i]);
        }
        if (genes > 0) KeepHalfOfTheGenes(counts, genes);
    }

    private long Half(long n) => n / 2 + ((n & 1) == 1 ? (long)(_stream.NextUInt64() >> 63) : 0);

    private void KeepHalfOfTheGenes(long[] counts, long total)
    {
        var keep = Half(total);
        var left = total;
        foreach (var g in cycle.Genes)
        {
            var kept = 0L;
            for (var copy = 0L; copy < counts[g]; copy++, left--)
            {
                if (keep == 0) break;
                if (_stream.NextDouble() * left < keep)
                {
                    kept++;
                    keep--;
                }
            }
            counts[g] = kept;
        }
    }
}
