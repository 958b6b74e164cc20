using CopyNumber.Network;

namespace CopyNumber.Deterministic;

/// <summary>
/// Solves a network's rate equations dx/dt = N·v(x) from its initial counts (as real numbers) and
/// records species and readouts on a <see cref="TimeGrid"/>. Schedule changes act exactly at their
/// times, segment by segment of the network's <see cref="Timeline"/> (which decides when a change
/// coincides with a grid time): the integration stops at a change, the changes apply in schedule order
/// (values evaluated on the state and parameters in force just before each change), and the integrator
/// restarts, since a jump invalidates its step history. A change at a grid time is in force when that
/// point is recorded, and readouts are evaluated with the parameter values in force at each point.
/// A state-triggered change acts when its condition turns from false to true: the crossing is located on
/// the integrator's dense output (<see cref="OdeRun.Advance"/>), the changes apply there, in file order,
/// and the integrator restarts, as at a timed change.
/// States are not clipped at zero: small negative round-off is left as computed.
/// </summary>
public static class RateEquationSolver
{
    /// <summary>Integrates <paramref name="network"/> over <paramref name="grid"/>.</summary>
    /// <param name="network">The compiled network.</param>
    /// <param name="grid">Recording times, in model time units.</param>
    /// <param name="options">Method and tolerances (absolute tolerance in copy numbers).</param>
    /// <returns>Species then readouts at every grid point.</returns>
    /// <exception cref="ArgumentException">The options are unusable (the message says why).</exception>
    /// <exception cref="SolverFailureException">
    /// The integration failed, a state or rate became non-finite, or a scheduled change gave a non-finite value
    /// or drove a species negative; the message names the time and the species or parameter.
    /// </exception>
    /// <param name="parameterValues">Values of every parameter at time 0 in place of the model's (one cell's draw of the
    /// parameters that vary per cell); null for the model's own.</param>
    public static DeterministicSolution Solve(ReactionNetwork network, TimeGrid grid, SolverOptions options, IReadOnlyList<double>? parameterValues = null)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Check() is { } problem) throw new ArgumentException(problem, nameof(options));
        ModelSupport.RequireRateEquations(network);

        var system = new RateEquationSystem(network);
        if (parameterValues is not null)
        {
            if (parameterValues.Count != network.Parameters.Count)
                throw new ArgumentException($"{parameterValues.Count} parameter values for {network.Parameters.Count} parameters", nameof(parameterValues));
            for (var p = 0; p < parameterValues.Count; p++) system.SetParameter(p, parameterValues[p]);
        }
        var parameters = system.ParameterArray;
        var speciesCount = network.Species.Count;
        var readouts = network.Readouts;
        var columns = network.Species.Concat(readouts.Select(r => r.Name)).ToArray();
        var values = new double[grid.Count, columns.Length];
        var state = network.InitialAmounts.ToArray();
        var run = new OdeRun(system, options);

        void Record(int point, double[] x)
        {
            // Checked at every grid time when asked, as the simulators check each propensity they compute (one message for both).
            var rate = 0.0;
            var bad = options.RefuseNegativeRates ? system.UnusableRate(x, out rate) : -1;
            if (bad >= 0)
                throw new SolverFailureException(grid[point], componentName: null,
                    Kinetics.UnusableRate.Describe(network.Reactions[bad].Name, "rate", rate, grid[point], State(network, x)));
            for (var i = 0; i < speciesCount; i++) values[point, i] = x[i];
            for (var r = 0; r < readouts.Count; r++) values[point, speciesCount + r] = readouts[r].OnState(x, parameters);
        }

        var triggers = new RealStateTriggers(network, parameters, (change, time) => Apply(change, state, system, time));
        TimelineIntegration.Run(run, Timeline.ForRateEquations(network, grid), state, change => Apply(change, state, system, change.Time), Record, triggers);

        return new DeterministicSolution(grid, columns, speciesCount, values, run.Statistics);
    }

    /// <summary>The first species as name=value, as the simulators' failure messages show them.</summary>
    private static string State(ReactionNetwork network, double[] x) =>
        string.Join(", ", Enumerable.Range(0, Math.Min(x.Length, 12)).Select(i => $"{network.Species[i]}={x[i].ToString("G6", System.Globalization.CultureInfo.InvariantCulture)}"))
        + (x.Length > 12 ? $", … ({x.Length - 12} more)" : "");

    private static void Apply(ScheduledChange change, double[] state, RateEquationSystem system, double time)
    {
        var value = change.OnState(state, system.ParameterArray);
        var old = change.Target == ScheduleTarget.Species ? state[change.TargetIndex] : system.ParameterArray[change.TargetIndex];
        var updated = change.Combine(old, value);
        var what = change.Target == ScheduleTarget.Species ? $"species {change.TargetName}" : $"parameter {change.TargetName}";
        if (!double.IsFinite(updated))
            throw new SolverFailureException(time, what, $"the scheduled change gives the non-finite value {updated}");
        if (change.Target == ScheduleTarget.Parameter)
        {
            system.SetParameter(change.TargetIndex, updated);
            return;
        }
        // A count may sit slightly below zero from round-off; only a change that pushes it further down is an error.
        if (updated < 0 && updated < old)
            throw new SolverFailureException(time, what, $"the scheduled change makes the count negative ({updated:G6})");
        state[change.TargetIndex] = updated;
    }
}
