using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// One replicate's state-triggered changes (<see cref="StateTrigger"/>): which conditions hold, which
/// turned from false to true and wait to apply, and the application itself. Per thread; nothing is
/// allocated per event.
/// </summary>
/// <remarks>
/// The rules (docs/network-language.md, "Triggered changes"):
/// - a condition holds when its value is neither 0 nor NaN; its value at the start (after the timed
///   changes at time 0) is its starting value, so a condition that already holds then does not fire until
///   it has been false (SBML's <c>initialValue="true"</c>);
/// - it is evaluated after every event that changes a species it reads (precomputed per reaction from
///   N and the species the condition reads, so an event that cannot change it costs one flag test), and
///   on every trigger after each change instant of the schedule and after each round of triggered changes;
/// - the triggers that turned from false to true at one evaluation apply their assignments at once, at
///   that time, in file order, each assignment seeing the result of the one before (every such trigger
///   applies, even when an earlier one made its condition false again: SBML's persistent events); then
///   every condition is evaluated again and those that turned true form the next round, up to
///   <see cref="StateTrigger.MaxRounds"/> rounds, beyond which the run stops with a message.
/// </remarks>
internal sealed class TriggerWatch
{
    private readonly StateTrigger[] _triggers;
    private readonly int[] _watchStart;   // reaction j's triggers to evaluate: _watched[_watchStart[j] .. _watchStart[j+1]−1]
    private readonly int[] _watched;
    private readonly bool[] _holds;
    private readonly bool[] _pending;
    private bool _anyPending;

    public TriggerWatch(ReactionNetwork network)
    {
        _triggers = [.. network.Triggers];
        _holds = new bool[_triggers.Length];
        _pending = new bool[_triggers.Length];
        var reactions = network.Stoichiometry.ReactionCount;
        _watchStart = new int[reactions + 1];
        var watched = new List<int>();
        for (var j = 0; j < reactions; j++)
        {
            var changed = network.Stoichiometry.ChangedSpecies(j);
            for (var t = 0; t < _triggers.Length; t++)
                if (Reads(_triggers[t], changed)) watched.Add(t);
            _watchStart[j + 1] = watched.Count;
        }
        _watched = [.. watched];
    }

    /// <summary>True when the network has state-triggered changes.</summary>
    public bool Any => _triggers.Length > 0;

    /// <summary>The triggers, in file order.</summary>
    public IReadOnlyList<StateTrigger> Triggers => _triggers;

    /// <summary>True when a firing of <paramref name="reaction"/> may change some trigger's condition.</summary>
    public bool WatchedBy(int reaction) => _watchStart[reaction] < _watchStart[reaction + 1];

    /// <summary>True when a trigger turned true and waits for <see cref="FirePending"/>.</summary>
    public bool AnyPending => _anyPending;

    /// <summary>A new replicate: each condition's starting value from the state (after the changes at time 0); nothing pending.</summary>
    public void Start(SimulatorState state)
    {
        for (var t = 0; t < _triggers.Length; t++)
        {
            _holds[t] = Holds(t, state);
            _pending[t] = false;
        }
        _anyPending = false;
    }

    /// <summary>Evaluates the conditions <paramref name="reaction"/>'s firing may have changed.</summary>
    /// <returns>True when a trigger is now pending.</returns>
    public bool AfterFiring(int reaction, SimulatorState state)
    {
        for (var w = _watchStart[reaction]; w < _watchStart[reaction + 1]; w++) Evaluate(_watched[w], state);
        return _anyPending;
    }

    /// <summary>Evaluates every condition (after a leap or a change instant).</summary>
    /// <returns>True when a trigger is now pending.</returns>
    public bool CheckAll(SimulatorState state)
    {
        for (var t = 0; t < _triggers.Length; t++) Evaluate(t, state);
        return _anyPending;
    }

    /// <summary>
    /// Applies the pending triggers at <paramref name="time"/>, in file order, then the rounds they set off;
    /// the caller then refreshes propensities and pending event times.
    /// </summary>
    /// <returns>True when anything was applied.</returns>
    public bool FirePending(SimulatorState state, double time)
    {
        if (!_anyPending) return false;
        var switches = state.Switches;
        if (switches.Counting) switches.BeforeSchedule(state.Counts);
        for (var round = 1; _anyPending; round++)
        {
            _anyPending = false;
            var parametersChanged = false;
            for (var t = 0; t < _triggers.Length; t++)
            {
                if (!_pending[t]) continue;
                _pending[t] = false;
                if (round > StateTrigger.MaxRounds) throw SimulationFailureException.TriggersCascade(_triggers[t], time, StateTrigger.MaxRounds);
                foreach (var assignment in _triggers[t].Assignments)
                    parametersChanged |= ScheduleCursor.Apply(assignment, state, time);
            }
            if (parametersChanged) state.RefreshConstants();
            CheckAll(state);
        }
        if (switches.Counting) switches.AfterSchedule(state.Counts, countFlips: time > 0);
        return true;
    }

    /// <summary>Evaluates every condition after timed changes and applies those that turned true.</summary>
    public bool AfterTimedChanges(SimulatorState state, double time) => Any && CheckAll(state) && FirePending(state, time);

    private void Evaluate(int t, SimulatorState state)
    {
        var now = Holds(t, state);
        if (now && !_holds[t])
        {
            _pending[t] = true;
            _anyPending = true;
        }
        _holds[t] = now;
    }

    private bool Holds(int t, SimulatorState state) => StateTrigger.Holds(_triggers[t].OnCounts(state.Counts, state.Parameters));

    private static bool Reads(StateTrigger trigger, ReadOnlySpan<int> changed)
    {
        if (trigger.SpeciesRead is null) return true;
        foreach (var i in changed)
            if (trigger.SpeciesRead.Contains(i)) return true;
        return false;
    }
}
