using CopyNumber.Network;

namespace CopyNumber.Deterministic;

/// <summary>
/// State-triggered changes on a rate-equation state: which conditions hold, whether a state makes one
/// turn from false to true, and the application of those that did, in file order, with the rounds they
/// set off (the rules of <c>TriggerWatch</c> in the simulators, docs/network-language.md). The integrator
/// locates the crossing on its dense output (<see cref="OdeRun.Advance"/>); this class only judges states.
/// </summary>
internal sealed class RealStateTriggers
{
    private readonly StateTrigger[] _triggers;
    private readonly double[] _parameters;
    private readonly Action<ScheduledChange, double> _apply;
    private readonly bool[] _holds;
    private readonly bool[] _pending;

    /// <param name="network">The network whose triggers are watched.</param>
    /// <param name="parameters">The live parameter values (changed in place by the changes).</param>
    /// <param name="apply">Applies one assignment at a time to the state being integrated.</param>
    public RealStateTriggers(ReactionNetwork network, double[] parameters, Action<ScheduledChange, double> apply)
    {
        _triggers = [.. network.Triggers];
        _parameters = parameters;
        _apply = apply;
        _holds = new bool[_triggers.Length];
        _pending = new bool[_triggers.Length];
    }

    /// <summary>True when the network has triggers.</summary>
    public bool Any => _triggers.Length > 0;

    /// <summary>The condition values at the start (after the changes at time 0): a condition that holds then does not fire.</summary>
    public void Start(double[] state)
    {
        for (var t = 0; t < _triggers.Length; t++) _holds[t] = Holds(t, state);
    }

    /// <summary>True when <paramref name="state"/> makes some condition that does not hold now hold; nothing is changed.</summary>
    public bool TurnsTrue(double[] state) => FirstTurningTrue(state) is not null;

    /// <summary>The first trigger, in file order, whose condition <paramref name="state"/> makes turn true; null when none.</summary>
    public StateTrigger? FirstTurningTrue(double[] state)
    {
        for (var t = 0; t < _triggers.Length; t++)
            if (!_holds[t] && Holds(t, state)) return _triggers[t];
        return null;
    }

    /// <summary>
    /// Evaluates every condition on <paramref name="state"/> at <paramref name="time"/> and applies the
    /// triggers that turned true, in file order, then the rounds they set off.
    /// </summary>
    /// <returns>True when anything was applied.</returns>
    /// <exception cref="SolverFailureException">The changes kept setting each other off for <see cref="StateTrigger.MaxRounds"/> rounds.</exception>
    public bool Fire(double time, double[] state)
    {
        var applied = false;
        for (var round = 1; Evaluate(state); round++)
        {
            for (var t = 0; t < _triggers.Length; t++)
            {
                if (!_pending[t]) continue;
                _pending[t] = false;
                if (round > StateTrigger.MaxRounds)
                    throw new SolverFailureException(time, null,
                        $"state-triggered changes kept setting each other off for {StateTrigger.MaxRounds} rounds (last: '{_triggers[t].Text}' on line {_triggers[t].Position.Line})");
                foreach (var assignment in _triggers[t].Assignments) _apply(assignment, time);
            }
            applied = true;
        }
        return applied;
    }

    private bool Evaluate(double[] state)
    {
        var any = false;
        for (var t = 0; t < _triggers.Length; t++)
        {
            var now = Holds(t, state);
            if (now && !_holds[t]) any = _pending[t] = true;
            _holds[t] = now;
        }
        return any;
    }

    private bool Holds(int t, double[] state) => StateTrigger.Holds(_triggers[t].OnState(state, _parameters));
}
