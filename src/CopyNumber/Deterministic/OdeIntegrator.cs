namespace CopyNumber.Deterministic;

/// <summary>
/// Adaptive integration of an <see cref="IOdeSystem"/> with Dormand–Prince 5(4), Rodas4, or both with
/// automatic stiffness switching (<see cref="SolverKind"/>). Requested output times are served by each
/// method's dense output, so asking for more outputs never changes the steps taken; the integration
/// ends exactly at the last output time. The error estimate controls the state at step points; dense
/// output between them is of order 4 (explicit) or 3 (stiff) and follows the same steps, which the
/// state's own variation limits. (A non-autonomous driver that the state follows exactly, as in the
/// Prothero–Robinson problem, is invisible to a stiffly accurate error estimate and can allow steps
/// longer than the driver's time scale; the rate equations of a network are autonomous.)
/// </summary>
public static class OdeIntegrator
{
    /// <summary>
    /// Integrates y' = f(t, y), y(<paramref name="t0"/>) = <paramref name="y0"/>, forward to every output time.
    /// </summary>
    /// <param name="system">The problem.</param>
    /// <param name="t0">Start time.</param>
    /// <param name="y0">Initial state, length <see cref="IOdeSystem.Dimension"/>; not modified.</param>
    /// <param name="outputTimes">Nondecreasing times ≥ <paramref name="t0"/> (a time equal to t0 returns y0).</param>
    /// <param name="options">Method and tolerances.</param>
    /// <param name="statistics">Work counters of this call.</param>
    /// <returns>One new array per output time holding y at that time.</returns>
    /// <exception cref="ArgumentException">The arguments do not fit together (the message says how).</exception>
    /// <exception cref="SolverFailureException">The integration could not be completed.</exception>
    public static double[][] Integrate(
        IOdeSystem system, double t0, double[] y0, ReadOnlySpan<double> outputTimes, SolverOptions options,
        out OdeStatistics statistics)
    {
        ArgumentNullException.ThrowIfNull(system);
        ArgumentNullException.ThrowIfNull(y0);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Check() is { } problem) throw new ArgumentException(problem, nameof(options));
        if (y0.Length != system.Dimension)
            throw new ArgumentException($"the initial state has {y0.Length} components but the system has {system.Dimension}", nameof(y0));
        if (!double.IsFinite(t0)) throw new ArgumentException($"the start time must be finite (got {t0})", nameof(t0));
        for (var i = 0; i < y0.Length; i++)
            if (!double.IsFinite(y0[i]))
                throw new ArgumentException($"the initial value of {system.ComponentName(i)} is not finite ({y0[i]})", nameof(y0));
        for (var k = 0; k < outputTimes.Length; k++)
        {
            if (!double.IsFinite(outputTimes[k]) || outputTimes[k] < t0)
                throw new ArgumentException($"output time {outputTimes[k]} is not a finite time at or after the start {t0}", nameof(outputTimes));
            if (k > 0 && outputTimes[k] < outputTimes[k - 1])
                throw new ArgumentException($"output times must be nondecreasing ({outputTimes[k]} follows {outputTimes[k - 1]})", nameof(outputTimes));
        }

        var run = new OdeRun(system, options);
        statistics = run.Statistics;
        var results = new double[outputTimes.Length][];
        if (outputTimes.Length == 0) return results;
        var y = (double[])y0.Clone();
        run.Advance(t0, y, outputTimes[^1], outputTimes, (index, _, state) => results[index] = (double[])state.Clone());
        return results;
    }
}
