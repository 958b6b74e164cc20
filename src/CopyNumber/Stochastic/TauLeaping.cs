using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// Adaptive tau-leaping: the leap size of Cao, Gillespie &amp; Petzold (2006, J. Chem. Phys.
/// 124:044109) with the critical reactions of Cao, Gillespie &amp; Petzold (2005, J. Chem. Phys.
/// 123:054104), each leap explicit (Gillespie 2001, J. Chem. Phys. 115:1716) or trapezoidal
/// (Cao &amp; Petzold 2005, J. Comput. Phys. 206:395; quoted from memory) by the relaxation rule of
/// <see cref="LeapFormulaRule"/>. Approximate; the error is controlled by ε and θ.
/// </summary>
/// <remarks>
/// Each step, in the state x at time t:
/// 1. propensities a_j and a0; the critical reactions (a_j &gt; 0, fewer than n_c firings left) and a0c;
/// 2. τ' from the non-critical reactions (<see cref="LeapStepSize"/>), capped at 1/ρ₊ when a mode may
///    grow; the drift's Jacobian J = N·∂a/∂x and its rate bounds ρ, ρ₊ (<see cref="PropensityJacobian"/>);
/// 3. if τ' &lt; 10/a0 a leap would gain little: up to 100 steps of the direct method instead;
/// 4. otherwise τ'' ~ Exp(a0c); the leap is τ = min(τ', τ'', time to the next stop). Non-critical
///    reactions fire Poisson(a_j τ) times — corrected by the trapezoidal formula when τ·ρ &gt; θ; when τ''
///    is the minimum one critical reaction, chosen with probability a_j/a0c, fires once; otherwise none does;
/// 5. a leap that would make a count negative is rejected and tried again from step 3 with τ' = τ/2.
/// Grid and schedule times are stops: a leap that reaches one is cut there, so the state recorded at a
/// grid time is the state at that time. Counts are never negative. A leap that could carry a
/// state-triggered change's condition across is replaced by exact steps (<see cref="TriggerLeapGuard"/>),
/// which apply the change at the event that sets it off.
/// </remarks>
internal sealed class TauLeaping<TSelection> : IStochasticSimulator
    where TSelection : struct, IReactionSelection<TSelection>
{
    // Cao, Gillespie & Petzold (2006), §IV: exact steps when τ' is below a few (they use 10) times 1/a0,
    // and then 100 of them before trying to leap again.
    private const double ExactStepFactor = 10.0;
    private const int ExactStepBurst = 100;

    private readonly SimulatorState _state;
    private readonly ReactionEffects _effects;
    private readonly DirectMethod<TSelection> _exact;
    private readonly ThinnedDirectMethod? _thinned;   // the exact steps when a law reads time
    private readonly TimeDependence _time;
    private readonly BurstProducts _bursts;
    private readonly ScheduleCursor _schedule;
    private readonly GridRecorder _recorder = new();
    private readonly CriticalReactions _critical;
    private readonly TriggerLeapGuard _triggerGuard;
    private readonly LeapStepSize _stepSize;
    private readonly PropensityJacobian _jacobian;
    private readonly TrapezoidalLeap _trapezoid;
    private readonly double _theta;
    private readonly double _epsilon;
    private readonly PoissonDraw _poisson;
    private readonly long _maxEvents;
    private readonly double[] _propensity;
    private readonly long[] _firings;
    private readonly long[] _trial;

    public TauLeaping(ReactionNetwork network, SimulatorOptions options) : this(network, options, PoissonSampler.Sample)
    {
    }

    /// <summary>Tau-leaping with the given Poisson variates (tests may supply their own).</summary>
    internal TauLeaping(ReactionNetwork network, SimulatorOptions options, PoissonDraw poisson)
    {
        _state = new SimulatorState(network, options.Modes);
        _effects = new ReactionEffects(network, includeFired: false);
        _exact = new DirectMethod<TSelection>(_state, _effects, options.MaxEvents);
        _time = network.TimeDependence;
        _bursts = network.Bursts;
        if (_time.Any) _thinned = new ThinnedDirectMethod(_state, _effects, options.MaxEvents);
        _schedule = new ScheduleCursor(network);
        _critical = new CriticalReactions(_effects, options.CriticalThreshold);
        _critical.MarkBursty(network.Bursts);
        _triggerGuard = new TriggerLeapGuard(network);
        _stepSize = new LeapStepSize(network, _effects, options.Epsilon);
        _jacobian = new PropensityJacobian(_state, _effects);
        _trapezoid = new TrapezoidalLeap(_jacobian, _effects, _state.SpeciesCount);
        _theta = options.Relaxation;
        _epsilon = options.Epsilon;
        _poisson = poisson;
        _maxEvents = options.MaxEvents;
        _propensity = new double[_state.ReactionCount];
        _firings = new long[_state.ReactionCount];
        _trial = new long[_state.SpeciesCount];
    }

    /// <summary>Leaps taken with the trapezoidal formula since this simulator was made (for tests and diagnostics).</summary>
    internal long TrapezoidalLeaps { get; private set; }

    /// <summary>Leaps taken with the explicit formula since this simulator was made.</summary>
    internal long ExplicitLeaps { get; private set; }

    public void StartFrom(double[]? parameters) => _state.StartParameters = parameters;

    public ReplicateResult Run(ref Xoshiro256StarStar rng, TimeGrid grid, ITrajectoryObserver observer)
    {
        var counts = _state.Counts;
        _state.StartReplicate(_schedule, _recorder, grid, observer);
        _state.SeedBursts(ref rng);
        var t = 0.0;
        var events = 0L;
        var steps = 0L;
        while (true)
        {
            var stop = Math.Min(_recorder.NextTime, _schedule.NextTime);
            if (t >= stop)
            {
                if (_schedule.NextTime <= t)
                {
                    _schedule.ApplyDue(t, _state);
                    _state.Triggers.AfterTimedChanges(_state, t);
                    if (_state.Modes.Watching) _state.Modes.ObserveAll(counts, t);
                }
                _recorder.RecordThrough(t, counts);
                if (_recorder.Finished) return new ReplicateResult(events, steps, false) { Switches = _state.Switches.Finish(), Modes = _state.Modes.Finish(grid.Until) };
                continue;
            }
            var a0 = EvaluateAll(t);
            if (a0 > double.MaxValue) _state.ThrowTotalOverflow(t, _propensity);
            if (!(a0 > 0.0))
            {
                t = stop;
                continue;
            }
            var a0c = _critical.Classify(counts, _propensity);
            _jacobian.Update(_critical.IsCritical);
            var growthCap = LeapFormulaRule.GrowthCap(_jacobian.Growth);
            var tauPrime = Math.Min(_stepSize.Select(counts, _propensity, _critical.IsCritical), growthCap);
            // A leap past the explicit formula's relaxation bound is trapezoidal; its leap condition may
            // then leave out the fast pairs in partial equilibrium (LeapStepSize).
            if (_stepSize.HasReversiblePairs && LeapFormulaRule.UsesTrapezoid(tauPrime, _jacobian.Relaxation, _theta))
                tauPrime = Math.Min(_stepSize.Select(counts, _propensity, _critical.IsCritical, skipEquilibrium: true), growthCap);
            if (_thinned is not null) tauPrime = TimeCap(t, tauPrime);
            if (!Step(ref rng, ref t, stop, a0, a0c, tauPrime, ref events, ref steps))
                return new ReplicateResult(events, steps, true) { Switches = _state.Switches.Finish(), Modes = _state.Modes.Finish(t) };
        }
    }

    /// <summary>One leap, or a burst of exact steps; false when the event limit stopped the replicate.</summary>
    private bool Step(ref Xoshiro256StarStar rng, ref double t, double stop, double a0, double a0c, double tauPrime, ref long events, ref long steps)
    {
        var counts = _state.Counts;
        var critical = _critical.IsCritical;
        while (true)
        {
            if (tauPrime < ExactStepFactor / a0) return ExactSteps(ref rng, ref t, stop, ref events, ref steps);

            var remaining = stop - t;
            var tauCritical = a0c > 0.0 ? rng.NextExponential() / a0c : double.PositiveInfinity;
            var criticalFires = tauCritical <= tauPrime && tauCritical <= remaining;
            var reachesStop = !criticalFires && tauPrime >= remaining;
            var tau = criticalFires ? tauCritical : Math.Min(tauPrime, remaining);
            if (_triggerGuard.MayCross(counts, _state.Parameters, _propensity, tau)) return ExactSteps(ref rng, ref t, stop, ref events, ref steps);

            var firings = 0L;
            for (var j = 0; j < _firings.Length; j++)
            {
                var k = 0L;
                if (!critical[j] && _propensity[j] > 0.0)
                {
                    var mean = (_thinned is not null && _time.ReadsTime(j) ? AtMidpoint(j, t, tau) : _propensity[j]) * tau;
                    if (mean > PoissonSampler.MaxMean) _state.ThrowLeapTooLarge(j, mean, t);
                    k = _poisson(ref rng, mean);
                }
                _firings[j] = k;
                firings += k;
            }
            var trapezoidal = LeapFormulaRule.UsesTrapezoid(tau, _jacobian.Relaxation, _theta);
            if (trapezoidal)
            {
                if (!_trapezoid.Correct(_firings, critical, tau, ref rng))
                {
                    tauPrime = tau / 2;
                    continue;
                }
                firings = 0;
                foreach (var k in _firings) firings += Math.Abs(k);
            }
            if (criticalFires)
            {
                _firings[PickCritical(rng.NextDouble() * a0c)]++;
                firings++;
            }

            Array.Copy(counts, _trial, counts.Length);
            var overdrawn = false;
            for (var j = 0; j < _firings.Length; j++)
                if (_firings[j] != 0) overdrawn |= !ApplyWithinLimit(j, _firings[j], t);
            // Bursty reactions are always critical (CriticalReactions), so they fire only here, once at most.
            if (_bursts.Any)
                for (var j = 0; j < _firings.Length; j++)
                    if (_firings[j] > 0 && _bursts.Makes(j)) _state.AddBursts(j, _firings[j], _trial, t);
            if (overdrawn || AnyNegative(_trial))
            {
                tauPrime = tau / 2;
                continue;
            }
            if (firings > _maxEvents - events) return false;

            Array.Copy(_trial, counts, counts.Length);
            if (_state.Switches.Counting) CountSwitches();
            t = reachesStop ? stop : Math.Min(t + tau, stop);
            events += firings;
            steps++;
            if (trapezoidal) TrapezoidalLeaps++;
            else ExplicitLeaps++;
            // A crossing the guard's rule did not foresee still fires, at the leap's end.
            if (_triggerGuard.Any && _state.Triggers.CheckAll(_state)) _state.Triggers.FirePending(_state, t);
            // A leap's firings are not ordered in time: its modes are seen at its end (docs/methods-analysis.md).
            if (_state.Modes.Watching) _state.Modes.ObserveAll(counts, t);
            return true;
        }
    }

    /// <summary>Up to <see cref="ExactStepBurst"/> events of the direct method; a state-triggered change one of them sets off is applied at its time.</summary>
    private bool ExactSteps(ref Xoshiro256StarStar rng, ref double t, double stop, ref long events, ref long steps)
    {
        var before = events;
        SegmentEnd end;
        if (_thinned is not null)
        {
            _thinned.Refresh(t);
            end = _thinned.Advance(ref rng, ref t, stop, ExactStepBurst, _recorder, ref events, _maxEvents);
        }
        else
        {
            _exact.Refresh(t);
            end = _exact.Advance(ref rng, ref t, stop, ExactStepBurst, _recorder, ref events, _maxEvents);
        }
        steps += events - before;
        if (end == SegmentEnd.Triggered)
        {
            _state.Triggers.FirePending(_state, t);
            if (_state.Modes.Watching) _state.Modes.ObserveAll(_state.Counts, t);
        }
        return end != SegmentEnd.EventLimit;
    }

    /// <summary>
    /// Adds <paramref name="firings"/> firings of reaction <paramref name="reaction"/> to the trial counts
    /// (a negative number, which only the trapezoidal formula yields, as that many reverse firings);
    /// stops the run when a count would pass <see cref="FiringProgram.CountLimit"/>, and returns false
    /// (without finishing) for a loss of more than 2^62 copies, which overdraws the count as surely as any
    /// rejected leap, before the product can overflow.
    /// </summary>
    private bool ApplyWithinLimit(int reaction, long firings, double time)
    {
        var start = _effects.ChangeStart;
        var sign = firings < 0 ? -1L : 1L;
        firings *= sign;
        for (var e = start[reaction]; e < start[reaction + 1]; e++)
        {
            var species = _effects.ChangeSpecies[e];
            var amount = sign * _effects.ChangeAmount[e];
            if (amount > 0)
            {
                if (firings > (FiringProgram.CountLimit - _trial[species]) / amount)
                    _state.ThrowLeapOverflow(reaction, species, firings * (double)amount, time, _trial[species]);
                _trial[species] += firings * amount;
            }
            else if (firings > FiringProgram.CountLimit / -amount) return false;
            else _trial[species] += firings * amount;
        }
        return true;
    }

    /// <summary>Every firing of a reaction that changes a two-state species is one switch.</summary>
    private void CountSwitches()
    {
        for (var j = 0; j < _firings.Length; j++)
            if (_firings[j] != 0 && _state.Switches.TwoState.ChangedBy(j)) _state.Switches.Fired(j, _firings[j]);
    }

    /// <summary>
    /// A law that reads time, at the leap's midpoint t + τ/2: the mean number of firings a_j(t + τ/2)·τ is
    /// the midpoint rule for ∫ a_j over the leap, error O(τ³·a_j'') (common practice for quadrature).
    /// </summary>
    private double AtMidpoint(int reaction, double t, double tau)
    {
        _state.SetTime(t + tau / 2);
        var a = _state.Evaluate(reaction, t + tau / 2);
        _state.SetTime(t);
        return a;
    }

    /// <summary>
    /// The leap condition carried over to time (ours, in the spirit of Cao, Gillespie &amp; Petzold 2006): over
    /// the leap no law that reads time may move by more than ε·a_j(t) at the current state, checked on the
    /// interval enclosure of the law over [t, t + τ] and τ halved until it holds (at most 40 times, after
    /// which the short leap turns into exact steps anyway).
    /// </summary>
    private double TimeCap(double t, double tau)
    {
        for (var halving = 0; halving < 40; halving++)
        {
            var within = true;
            foreach (var j in _time.Reactions)
            {
                var (lower, upper) = _time.Range(j, _state.Counts, _state.Parameters, t, t + tau);
                var allowed = _epsilon * _propensity[j];
                if (!(upper - _propensity[j] <= allowed && _propensity[j] - lower <= allowed)) { within = false; break; }
            }
            if (within) return tau;
            tau /= 2;
        }
        return tau;
    }

    private double EvaluateAll(double time)
    {
        _state.SetTime(time);
        var total = 0.0;
        for (var j = 0; j < _propensity.Length; j++)
        {
            var a = _state.Evaluate(j, time);
            _propensity[j] = a;
            total += a;
        }
        return total;
    }

    /// <summary>The critical reaction whose cumulative interval holds <paramref name="point"/> ∈ [0, a0c).</summary>
    private int PickCritical(double point)
    {
        var critical = _critical.IsCritical;
        var last = -1;
        for (var j = 0; j < _propensity.Length; j++)
        {
            if (!critical[j]) continue;
            last = j;
            point -= _propensity[j];
            if (point < 0.0) return j;
        }
        return last;
    }

    private static bool AnyNegative(long[] counts)
    {
        foreach (var x in counts)
            if (x < 0) return true;
        return false;
    }
}
