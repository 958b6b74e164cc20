using System.Diagnostics;
using CopyNumber.Analysis;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.MasterEquation;

/// <summary>
/// Solves the chemical master equation dP/dt = A·P by finite state projection (Munsky &amp; Khammash 2006,
/// J. Chem. Phys. 124:044104) with a projection that grows as the solution needs it, stepping in time by
/// <see cref="Uniformisation"/> or <see cref="KrylovExponential"/> as <see cref="StepperRule"/> decides per
/// stretch between grid times, and applying the schedule exactly at its times (see docs/methods.md).
/// </summary>
/// <remarks>
/// <para>Growth rule. The projection starts as the initial state. A step [t, t+h] is accepted when the
/// probability outside the projection afterwards is at most ε·(t+h)/T, so the bound grows no faster than
/// its share of the run and is at most ε at every grid time. A refused step is undone; the boundary states
/// are ranked by the probability they sent out during the step (leak rate × time-integrated probability),
/// and the fewest of them that account for all but a tenth of that step's allowance grow outwards along
/// the reactions that left the projection: the r-th retry of a step adds 2^(r−1) rings of states
/// reachable from there (N-step reachability, so a distribution that travels far in one step needs only
/// a logarithmic number of retries). Growth follows reachability, so states the network cannot reach
/// never enter, and conservation laws are respected without being imposed. Before each step the projection
/// may grow ahead of it (see <see cref="PreGrow"/>), so that fewer steps are refused and redone.</para>
/// <para>What is refused: a parameter change whose value differs between states with probability (it
/// would make the parameter a random variable), a negative or non-finite propensity, a projection beyond
/// <see cref="ExactOptions.MaxStates"/>.</para>
/// </remarks>
public sealed class FiniteStateProjection
{
    private readonly ReactionNetwork _network;
    private readonly ExactOptions _options;
    private readonly ParallelOptions _parallel;
    private readonly double[] _parameters;
    private readonly double[] _constants;
    private readonly long[] _counts;
    private readonly long[] _targetCounts;
    private readonly int[] _key;
    private StateSpace _space;
    private Generator? _generator;
    private Uniformisation? _propagator;
    private readonly KrylovExponential _krylov;
    private readonly StepperRule _rule;
    private double _krylovStep = double.NaN;
    private double _krylovError;
    private int _krylovSteps;
    private int _refusals;
    private double[] _lastOccupancy = [];
    private double _lastStep;
    private int _preRings = 1;
    private double[] _p = [];
    private double _steppingError;
    private long _products;
    private double _largestRate;

    private FiniteStateProjection(ReactionNetwork network, ExactOptions options)
    {
        _network = network;
        _options = options;
        _parallel = new ParallelOptions { MaxDegreeOfParallelism = options.Threads > 0 ? options.Threads : Environment.ProcessorCount };
        _parameters = network.ParameterValuesWithTime();
        _constants = new double[network.Reactions.Count];
        network.Propensities.ComputeConstants(_parameters, _constants);
        _counts = new long[network.Species.Count];
        _targetCounts = new long[network.Species.Count];
        _space = new StateSpace(StateCoding.For(network));
        _key = new int[_space.Dimension];
        _krylov = new KrylovExponential(_parallel);
        _rule = new StepperRule(options.Stepping);
    }

    /// <summary>Solves the master equation of <paramref name="network"/> on <paramref name="grid"/>.</summary>
    /// <exception cref="MasterEquationException">The projection would exceed its limit, or the model is refused (see remarks).</exception>
    /// <exception cref="OperationCanceledException">Cancelled.</exception>
    public static ExactSolution Solve(ReactionNetwork network, TimeGrid grid, ExactOptions options, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        ArgumentNullException.ThrowIfNull(options);
        if (!(options.Tolerance > 0 && options.Tolerance < 1)) throw new ArgumentOutOfRangeException(nameof(options), "the tolerance lies in (0, 1)");
        // The master equation is over counts: what the simulators cannot carry out, it cannot either (state-triggered changes, non-integer amounts).
        ModelSupport.RequireStochastic(network);
        var clock = Stopwatch.StartNew();
        var solver = new FiniteStateProjection(network, options);
        return solver.Run(grid, clock, cancel);
    }

    /// <summary>The projection and probabilities at the end of the last solve, for the stationary solve.</summary>
    internal (StateSpace Space, double[] Probabilities, double[] Parameters) Final => (_space, _p, _parameters);

    /// <summary>Solves on <paramref name="grid"/> and returns the solver, whose final projection the stationary solve starts from.</summary>
    internal static (ExactSolution Solution, FiniteStateProjection Solver) SolveKeepingState(ReactionNetwork network, TimeGrid grid, ExactOptions options, CancellationToken cancel)
    {
        var clock = Stopwatch.StartNew();
        var solver = new FiniteStateProjection(network, options);
        return (solver.Run(grid, clock, cancel), solver);
    }

    private ExactSolution Run(TimeGrid grid, Stopwatch clock, CancellationToken cancel)
    {
        if (!_space.Coding.TryEncode(_network.InitialCounts.ToArray(), _key))
            throw new MasterEquationException("an initial count does not fit in 32 bits; the master equation cannot be solved for counts that large (use 'simulate')");
        _space.Add(_key);
        _p = [1.0];

        var quantities = Quantity.Of(_network);
        var laws = new ExactLaw[grid.Count, quantities.Count];
        var bound = new double[grid.Count];
        var stepping = new double[grid.Count];
        var states = new int[grid.Count];
        var joint = new IReadOnlyList<(long, long, double)>[_options.Joint is null ? 0 : grid.Count];
        var timeline = Timeline.Of(_network, grid);
        var t = 0.0;
        foreach (var segment in timeline.Segments)
        {
            for (var c = segment.FirstChange; c < segment.EndChange; c++) Apply(timeline.Changes[c]);
            for (var k = segment.FirstPoint; k < segment.EndPoint; k++)
            {
                t = Advance(t, grid[k], grid.Until, cancel);
                Record(k, quantities, laws);
                if (_options.Joint is { } pair) joint[k] = JointLaw(pair.First, pair.Second);
                bound[k] = Bound();
                stepping[k] = _steppingError;
                states[k] = _space.Count;
            }
            if (segment.End > t) t = Advance(t, segment.End, grid.Until, cancel);
        }
        return new ExactSolution(grid, quantities, laws, bound, stepping, states, _products, _largestRate, _space.Dimension, clock.Elapsed)
        {
            KrylovSteps = _krylovSteps,
            KrylovError = _krylovError,
            RefusedSteps = _refusals,
            Joint = joint,
        };
    }

    /// <summary>1 − Σp over <paramref name="p"/>, clamped at 0 (the sum is computed with compensation, so round-off does not fake a bound).</summary>
    private static double MissingOf(double[] p)
    {
        double sum = 0, compensation = 0;
        foreach (var x in p)
        {
            var y = x - compensation;
            var s = sum + y;
            compensation = s - sum - y;
            sum = s;
        }
        return Math.Max(0, 1 - sum);
    }

    /// <summary>
    /// The reported bound on ‖p_true − p‖₁: 1 − Σp, plus twice the Krylov steps' error estimates (one for the
    /// mass they may have added to Σp, one for their own error); with uniformisation only it is exactly 1 − Σp.
    /// </summary>
    private double Bound() => MissingOf(_p) + 2 * _krylovError;

    private double Advance(double t, double target, double until, CancellationToken cancel)
    {
        var epsilon = _options.Tolerance;
        var errorPerTime = epsilon * ExactOptions.SteppingShare / until;
        var retries = 0;
        if (!(t < target)) return t;
        EnsureGenerator();
        var krylov = _rule.UseKrylov(_propagator!.Rate, target - t);
        while (t < target)
        {
            cancel.ThrowIfCancellationRequested();
            if (_products > _options.MaxProducts)
                throw new MasterEquationException($"the solve needs more than {_options.MaxProducts:N0} sparse products (its limit) to reach t = {target:G6}");
            EnsureGenerator();
            double Longest()
            {
                var longest = krylov ? (double.IsNaN(_krylovStep) ? double.PositiveInfinity : _krylovStep) : _propagator!.LongestStep;
                // A Krylov step that would leave a sliver (under a tenth of a step) before the target takes the sliver too.
                return krylov && target - t <= 1.1 * longest ? target - t : Math.Min(target - t, longest);
            }
            var h = Longest();
            // Grow before stepping where the current support already sends out more than half the step's allowance.
            if (retries == 0 && PreGrow(h, epsilon * (t + h) / until - Bound()))
            {
                EnsureGenerator();
                h = Longest();
            }
            var end = target - (t + h) <= 1e-12 * Math.Max(1, target) ? target : t + h;
            h = end - t;
            var result = new double[_space.Count];
            var occupancy = new double[_space.Count];
            double error;
            double krylovWork = 0;
            var next = _krylovStep;
            if (krylov)
            {
                var (productsBefore, passesBefore) = (_krylov.Products, _krylov.VectorPasses);
                (var taken, error, next) = _krylov.Step(_generator!, _p, h, _krylovStep, errorPerTime, result);
                if (taken < h) { end = t + taken; h = taken; }
                _products += _krylov.Products - productsBefore;
                krylovWork = _krylov.Products - productsBefore + (_krylov.VectorPasses - passesBefore) / StepperRule.PassesPerProduct;
                for (var i = 0; i < result.Length; i++)
                {
                    // Clearing a negative entry moves it toward the nonnegative projected solution, so no error is added.
                    if (result[i] < 0) result[i] = 0;
                    occupancy[i] = 0.5 * h * (_p[i] + result[i]);
                }
            }
            else
            {
                var productsBefore = _propagator.Products;
                error = _propagator.Advance(_p, h, errorPerTime * h, result, occupancy);
                _products += _propagator.Products - productsBefore;
            }
            var allowance = epsilon * end / until;
            if (MissingOf(result) + 2 * (_krylovError + (krylov ? error : 0)) <= allowance)
            {
                _p = result;
                _lastOccupancy = occupancy;
                _lastStep = h;
                // The rings the last refused try of this step needed are grown ahead of the next step; they shrink again when not needed.
                _preRings = retries > 0 ? Math.Max(_preRings, 1 << Math.Min(retries - 1, 20)) : Math.Max(1, _preRings / 2);
                _steppingError += error;
                if (krylov)
                {
                    _rule.RecordKrylov(krylovWork, h);
                    _krylovError += error;
                    _krylovSteps++;
                    _krylovStep = next;
                }
                t = end;
                retries = 0;
                continue;
            }
            if (krylov) _krylovStep = h;
            retries++;
            _refusals++;
            if (!Grow(occupancy, allowance - Bound(), rings: 1 << Math.Min(retries - 1, 20)))
                throw new MasterEquationException("the projection cannot grow although probability leaves it; the network's reachable states are all included, so this is a round-off failure of the tolerance — ask for a larger --tolerance");
        }
        return t;
    }

    private void EnsureGenerator()
    {
        if (_generator is not null && _generator.States == _space.Count) return;
        // A grown projection (the only way states are added while a generator stands) re-derives its frontier rows only.
        _generator = _generator is null ? Generator.Build(_space, _network, _constants, _parameters, _parallel)
            : _generator.Extend(_space, _network, _constants, _parameters, _parallel);
        _propagator = new Uniformisation(_generator, _parallel);
        _largestRate = Math.Max(_largestRate, _propagator.Rate);
    }

    /// <summary>
    /// Grows before a step of length <paramref name="h"/> when the support is expected to send out more than half
    /// of <paramref name="stepAllowance"/>: each state's expected time-integrated probability over the step is the
    /// larger of p·h (the current support) and the previous accepted step's occupancy per unit time times h (where
    /// probability has been flowing); the leak rates times these are the expected outflow. True when states were added.
    /// </summary>
    private bool PreGrow(double h, double stepAllowance)
    {
        var generator = _generator!;
        if (double.IsInfinity(h)) return false;
        var occupancy = new double[generator.States];
        var outflow = 0.0;
        var rate = _lastStep > 0 ? h / _lastStep : 0;
        for (var i = 0; i < occupancy.Length; i++)
        {
            occupancy[i] = Math.Max(_p[i] * h, i < _lastOccupancy.Length ? _lastOccupancy[i] * rate : 0);
            outflow += generator.Leak[i] * occupancy[i];
        }
        if (!(outflow > 0.5 * Math.Max(0, stepAllowance))) return false;
        return Grow(occupancy, stepAllowance, rings: _preRings);
    }

    /// <summary>Grows the projection from the states that leaked most over a step (see the type's remarks); true when states were added.</summary>
    private bool Grow(double[] occupancy, double stepAllowance, int rings)
    {
        var generator = _generator!;
        var leaked = new List<(int State, double Mass)>();
        var total = 0.0;
        for (var i = 0; i < generator.States; i++)
        {
            if (generator.Leak[i] <= 0) continue;
            var mass = generator.Leak[i] * occupancy[i];
            leaked.Add((i, mass));
            total += mass;
        }
        leaked.Sort((a, b) => b.Mass.CompareTo(a.Mass));
        var keepOut = 0.1 * Math.Max(0, stepAllowance);
        var frontier = new List<int>();
        var remaining = total;
        foreach (var (state, mass) in leaked)
        {
            if (remaining <= keepOut && frontier.Count > 0 && total > 0) break;
            frontier.Add(state);
            remaining -= mass;
        }
        var before = _space.Count;
        var next = new List<int>();
        for (var ring = 0; ring < rings && frontier.Count > 0; ring++)
        {
            next.Clear();
            foreach (var state in frontier) AddSuccessors(state, next, onlyLeaking: ring == 0 ? generator.LeakReactions[state] : -1);
            (frontier, next) = (next, frontier);
        }
        if (_space.Count == before) return false;
        var grown = new double[_space.Count];
        Array.Copy(_p, grown, _p.Length);
        _p = grown;
        return true;
    }

    /// <summary>Adds the states one firing away from <paramref name="state"/> (for reactions in the bit mask <paramref name="onlyLeaking"/>) to the space and to <paramref name="added"/> when new.</summary>
    private void AddSuccessors(int state, List<int> added, int onlyLeaking)
    {
        _space.Counts(state, _counts);
        for (var j = 0; j < _network.Reactions.Count; j++)
        {
            if (j < 32 && (onlyLeaking & (1 << j)) == 0) continue;
            if (!(_network.Propensities.Evaluate(j, _counts, _constants, _parameters) > 0)) continue;
            Array.Copy(_counts, _targetCounts, _counts.Length);
            _network.Stoichiometry.Apply(j, _targetCounts);
            if (_targetCounts.Any(x => x < 0) || !_space.Coding.TryEncode(_targetCounts, _key)) continue;
            if (_space.IndexOf(_key) >= 0) continue;
            if (_space.Count >= _options.MaxStates) throw TooLarge();
            added.Add(_space.Add(_key).Index);
        }
    }

    private MasterEquationException TooLarge() => new(
        $"the projection needs more than {_options.MaxStates:N0} states (--max-states) to keep the probability outside it below {_options.Tolerance:G3}; "
        + "raise --max-states or --tolerance if memory allows, or use 'simulate' for a network this large")
    { StatesReached = _space.Count };

    /// <summary>Applies one scheduled change to the whole distribution at its time.</summary>
    private void Apply(ScheduledChange change)
    {
        _lastOccupancy = []; // where probability flowed before the change says nothing about after it
        if (change.Target == ScheduleTarget.Parameter)
        {
            double? value = null;
            for (var i = 0; i < _space.Count; i++)
            {
                if (_p[i] == 0) continue;
                _space.Counts(i, _counts);
                var v = change.OnCounts(_counts, _parameters);
                if (value is null) value = v;
                else if (Math.Abs(v - value.Value) > 1e-12 * Math.Max(1, Math.Abs(v)))
                    throw new MasterEquationException($"the schedule change of parameter '{change.TargetName}' at t = {change.Time:G6} depends on the counts, which would make the parameter random; the master-equation solver does not handle that (use 'simulate')");
            }
            var result = change.Combine(_parameters[change.TargetIndex], value ?? 0);
            if (!double.IsFinite(result)) throw new MasterEquationException($"the schedule change of parameter '{change.TargetName}' at t = {change.Time:G6} gives {result}");
            _parameters[change.TargetIndex] = result;
            _network.Propensities.ComputeConstants(_parameters, _constants);
            _generator = null;
            return;
        }
        // A species change maps each state's probability to the state it becomes; states merge when they land together.
        var count = _space.Count;
        var moved = new List<(int Target, double Mass)>(count);
        for (var i = 0; i < count; i++)
        {
            if (_p[i] == 0) continue;
            _space.Counts(i, _counts);
            var value = change.OnCounts(_counts, _parameters);
            if (!double.IsFinite(value) || Math.Abs(value) > int.MaxValue)
                throw new MasterEquationException($"the schedule change of '{change.TargetName}' at t = {change.Time:G6} gives {value} on a state with probability {_p[i]:G3}");
            var result = change.Combine(_counts[change.TargetIndex], (long)Math.Round(value, MidpointRounding.AwayFromZero));
            if (result < 0)
                throw new MasterEquationException($"the schedule change of '{change.TargetName}' at t = {change.Time:G6} makes it {result} on a state with probability {_p[i]:G3}");
            _counts[change.TargetIndex] = result;
            if (!_space.Coding.TryEncode(_counts, _key))
                throw new MasterEquationException($"the schedule change of '{change.TargetName}' at t = {change.Time:G6} gives a count beyond 32 bits");
            var existing = _space.IndexOf(_key);
            if (existing < 0 && _space.Count >= _options.MaxStates) throw TooLarge();
            moved.Add((existing >= 0 ? existing : _space.Add(_key).Index, _p[i]));
        }
        _p = new double[_space.Count];
        foreach (var (target, mass) in moved) _p[target] += mass;
        _generator = null;
    }

    /// <summary>The joint law of species <paramref name="first"/> and <paramref name="second"/> on the projection, normalised.</summary>
    private (long, long, double)[] JointLaw(int first, int second)
    {
        var law = new Dictionary<(long, long), double>();
        var total = 0.0;
        for (var i = 0; i < _space.Count; i++)
        {
            if (!(_p[i] > 0)) continue;
            _space.Counts(i, _counts);
            var key = (_counts[first], _counts[second]);
            law[key] = law.GetValueOrDefault(key) + _p[i];
            total += _p[i];
        }
        return law.OrderBy(e => e.Key.Item1).ThenBy(e => e.Key.Item2).Select(e => (e.Key.Item1, e.Key.Item2, e.Value / total)).ToArray();
    }

    /// <summary>Marginals of the count quantities and moments of the real readouts at grid point <paramref name="k"/>.</summary>
    private void Record(int k, IReadOnlyList<Quantity> quantities, ExactLaw[,] laws)
    {
        var marginals = quantities.Select(_ => new Dictionary<long, double>()).ToArray();
        var sums = new double[quantities.Count, 2];
        var largest = new double[quantities.Count];
        var total = 0.0;
        for (var i = 0; i < _space.Count; i++)
        {
            _space.Counts(i, _counts);
            for (var q = 0; q < quantities.Count; q++)
            {
                var quantity = quantities[q];
                var value = quantity.SpeciesIndex >= 0 ? _counts[quantity.SpeciesIndex] : _network.Readouts[quantity.ReadoutIndex].OnCounts(_counts, _parameters);
                largest[q] = Math.Max(largest[q], Math.Abs(value));
                var p = _p[i];
                if (p == 0) continue;
                if (quantity.IsCount)
                {
                    var x = (long)Math.Round(value);
                    marginals[q][x] = marginals[q].GetValueOrDefault(x) + p;
                }
                else
                {
                    sums[q, 0] += p * value;
                    sums[q, 1] += p * value * value;
                }
            }
            total += _p[i];
        }
        var missing = Bound();
        for (var q = 0; q < quantities.Count; q++)
        {
            var errorBar = missing * largest[q];
            if (quantities[q].IsCount)
            {
                var distribution = CountDistribution.FromProbabilities(marginals[q].Keys.ToArray(), marginals[q].Values.ToArray());
                laws[k, q] = new ExactLaw(distribution, distribution.Mean, distribution.Variance, errorBar);
            }
            else
            {
                var mean = sums[q, 0] / total;
                laws[k, q] = new ExactLaw(null, mean, Math.Max(0, sums[q, 1] / total - mean * mean), errorBar);
            }
        }
    }
}
