using System.Runtime.CompilerServices;
using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// One replicate's switches of each two-state species (<see cref="TwoStateSpecies"/>), counted at the
/// events themselves: every firing of a reaction that changes the species is one switch, and a schedule
/// change instant adds the species' change across it (0 or 1). Per thread; nothing allocated per event.
/// </summary>
/// <remarks>
/// The simulators call <see cref="Fired"/> only for reactions flagged in their firing program, so a
/// network without two-state species pays one predictable branch per event. After each change instant
/// <see cref="AfterSchedule"/> checks that the confining laws still hold; a species whose law the
/// schedule broke is marked <see cref="Broken"/> for the rest of the replicate.
/// </remarks>
internal sealed class TransitionCounter
{
    private readonly TwoStateSpecies _twoState;
    private readonly long[] _before;
    private readonly long[] _reported;

    public TransitionCounter(ReactionNetwork network)
    {
        _twoState = TwoStateSpecies.Of(network);
        Switches = new long[_twoState.Count];
        Broken = new bool[_twoState.Count];
        _before = new long[_twoState.Count];
        _reported = new long[_twoState.Count];
    }

    /// <summary>The two-state species counted.</summary>
    public TwoStateSpecies TwoState => _twoState;

    /// <summary>Switches so far in this replicate, by slot of <see cref="TwoStateSpecies.Species"/>.</summary>
    public long[] Switches { get; }

    /// <summary>True for a slot whose confining law a schedule change broke in this replicate.</summary>
    public bool[] Broken { get; }

    /// <summary>True when the network has two-state species to count.</summary>
    public bool Counting => _before.Length > 0;

    /// <summary>Zero counts, for a new replicate.</summary>
    public void Start()
    {
        Array.Clear(Switches);
        Array.Clear(Broken);
    }

    /// <summary>Reaction <paramref name="reaction"/> fired <paramref name="times"/> times.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    public void Fired(int reaction, long times = 1)
    {
        foreach (var slot in _twoState.SlotsChangedBy(reaction)) Switches[slot] += times;
    }

    /// <summary>Notes the two-state counts just before a change instant's changes apply.</summary>
    public void BeforeSchedule(long[] counts)
    {
        for (var s = 0; s < _before.Length; s++) _before[s] = counts[_twoState.Species[s]];
    }

    /// <summary>
    /// Checks that the confining laws still hold after a change instant and, when
    /// <paramref name="countFlips"/> (changes after t = 0; those at 0 set the initial state), counts the
    /// flips it made.
    /// </summary>
    public void AfterSchedule(long[] counts, bool countFlips)
    {
        for (var s = 0; s < _before.Length; s++)
        {
            var species = _twoState.Species[s];
            if (!StillConfines(_twoState.Laws[s], species, counts)) Broken[s] = true;
            if (countFlips) Switches[s] += Math.Abs(counts[species] - _before[s]);
        }
    }

    /// <summary>The law's new total T' (reactions keep it) still gives c_i·x_i ≤ T' &lt; 2·c_i.</summary>
    private static bool StillConfines(ConservationLaw law, int species, long[] counts)
    {
        var total = 0.0;
        var coefficients = law.Coefficients;
        for (var i = 0; i < counts.Length; i++)
            if (coefficients[i] != 0) total += coefficients[i] * (double)counts[i];
        return total < 2.0 * coefficients[species];
    }

    /// <summary>
    /// The replicate's switches by slot, −1 for a slot whose law the schedule broke: the view handed out
    /// in <see cref="ReplicateResult.Switches"/> (reused by the next replicate).
    /// </summary>
    public ReadOnlyMemory<long> Finish()
    {
        for (var s = 0; s < _reported.Length; s++) _reported[s] = Broken[s] ? -1 : Switches[s];
        return _reported;
    }
}
