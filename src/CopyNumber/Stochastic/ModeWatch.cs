using System.Runtime.CompilerServices;
using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// One replicate's visits to the modes of the species given cores (<see cref="ModeCore"/>), followed at the
/// events themselves: the mode last visited, when it was entered, the time spent in each mode and the
/// completed residences (exits). Per thread; nothing allocated per event.
/// </summary>
/// <remarks>
/// A residence in a mode runs from entering its core until entering the other mode's core (milestoning, so
/// a trajectory that leaves a core into the boundary region and comes back has not switched). The simulators
/// call <see cref="Fired"/> only for reactions flagged in their firing program (those that change a watched
/// species), so a run without cores pays one predictable branch per event; the generated loop calls
/// <see cref="Observe"/> directly for the watched species a reaction changes, and has no call at all when
/// nothing is watched. Changes made at stops (timed or triggered changes, divisions) are seen through
/// <see cref="ObserveAll"/>, tau-leaping's at the end of each leap.
/// </remarks>
internal sealed class ModeWatch
{
    private readonly ModeCore[] _cores;
    private readonly int[] _reactionStart;
    private readonly int[] _reactionSlots;
    private readonly int[] _mode;
    private readonly double[] _entered;
    private readonly ModeVisits[] _visits;

    public ModeWatch(ReactionNetwork network, IReadOnlyList<ModeCore> cores)
    {
        _cores = [.. cores];
        var n = network.Stoichiometry;
        var slotOf = new int[n.SpeciesCount];
        Array.Fill(slotOf, -1);
        for (var s = 0; s < _cores.Length; s++)
        {
            if (_cores[s].Species < 0 || _cores[s].Species >= n.SpeciesCount)
                throw new ArgumentException($"core '{_cores[s]}' names species {_cores[s].Species}, which the network does not have", nameof(cores));
            slotOf[_cores[s].Species] = s;
        }
        _reactionStart = new int[n.ReactionCount + 1];
        var slots = new List<int>();
        for (var j = 0; j < n.ReactionCount; j++)
        {
            _reactionStart[j] = slots.Count;
            foreach (var i in n.ChangedSpecies(j))
                if (slotOf[i] >= 0) slots.Add(slotOf[i]);
        }
        _reactionStart[n.ReactionCount] = slots.Count;
        _reactionSlots = [.. slots];
        _mode = new int[_cores.Length];
        _entered = new double[_cores.Length];
        _visits = new ModeVisits[_cores.Length];
    }

    /// <summary>The cores watched, by slot.</summary>
    public IReadOnlyList<ModeCore> Cores => _cores;

    /// <summary>True when some species is watched.</summary>
    public bool Watching => _cores.Length > 0;

    /// <summary>True when <paramref name="reaction"/> changes a watched species.</summary>
    public bool WatchedBy(int reaction) => _reactionStart[reaction + 1] > _reactionStart[reaction];

    /// <summary>The slots of the watched species <paramref name="reaction"/> changes.</summary>
    public ReadOnlySpan<int> SlotsChangedBy(int reaction) =>
        _reactionSlots.AsSpan(_reactionStart[reaction], _reactionStart[reaction + 1] - _reactionStart[reaction]);

    /// <summary>Forgets the last replicate and takes the state at t = 0 (after the changes due then) as its start.</summary>
    public void Start(long[] counts)
    {
        for (var s = 0; s < _cores.Length; s++)
        {
            _mode[s] = -1;
            _entered[s] = 0.0;
            _visits[s] = default;
        }
        ObserveAll(counts, 0.0);
    }

    /// <summary>Reaction <paramref name="reaction"/> fired at <paramref name="time"/>; <paramref name="counts"/> are after the firing.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    public void Fired(int reaction, long[] counts, double time)
    {
        foreach (var slot in SlotsChangedBy(reaction)) Observe(slot, counts[_cores[slot].Species], time);
    }

    /// <summary>Every watched species after changes at a stop (or a leap) ending at <paramref name="time"/>.</summary>
    public void ObserveAll(long[] counts, double time)
    {
        for (var s = 0; s < _cores.Length; s++) Observe(s, counts[_cores[s].Species], time);
    }

    /// <summary>The species in slot <paramref name="slot"/> has count <paramref name="count"/> from <paramref name="time"/> on.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    public void Observe(int slot, long count, double time)
    {
        var mode = _cores[slot].ModeOf(count);
        var last = _mode[slot];
        if (mode < 0 || mode == last) return;
        ref var visits = ref _visits[slot];
        if (last == 0)
        {
            visits.TimeLow += time - _entered[slot];
            visits.ExitsLow++;
        }
        else if (last == 1)
        {
            visits.TimeHigh += time - _entered[slot];
            visits.ExitsHigh++;
        }
        else visits.FirstEntry = time;
        _mode[slot] = mode;
        _entered[slot] = time;
    }

    /// <summary>
    /// Closes the replicate at <paramref name="end"/>: the residence still running is censored there (its
    /// time counts, its exit does not). Returns the view handed out in <see cref="ReplicateResult.Modes"/>
    /// (reused by the next replicate).
    /// </summary>
    public ReadOnlyMemory<ModeVisits> Finish(double end)
    {
        for (var s = 0; s < _cores.Length; s++)
        {
            ref var visits = ref _visits[s];
            visits.Final = _mode[s];
            if (_mode[s] == 0) visits.TimeLow += end - _entered[s];
            else if (_mode[s] == 1) visits.TimeHigh += end - _entered[s];
            else visits.FirstEntry = double.NaN;
        }
        return _visits;
    }
}

/// <summary>One replicate's visits to the two modes of one watched species (<see cref="ModeCore"/>).</summary>
public struct ModeVisits
{
    /// <summary>Time attributed to the low mode (from each entry into its core until the next entry into the high core, or the end), model time units.</summary>
    public double TimeLow;

    /// <summary>Time attributed to the high mode, likewise.</summary>
    public double TimeHigh;

    /// <summary>Completed residences in the low mode: switches low → high.</summary>
    public long ExitsLow;

    /// <summary>Completed residences in the high mode: switches high → low.</summary>
    public long ExitsHigh;

    /// <summary>The mode the replicate was in at the end (its censored residence): 0 low, 1 high, −1 it never entered a core.</summary>
    public int Final;

    /// <summary>When the replicate first entered a core (0 when it started in one); NaN when it never did.</summary>
    public double FirstEntry;

    /// <summary>Switches: entries into the core of the other mode than the one last visited.</summary>
    public readonly long Switches => ExitsLow + ExitsHigh;
}
