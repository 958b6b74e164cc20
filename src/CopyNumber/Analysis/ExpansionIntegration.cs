using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// Integrates <see cref="ExpansionSystem"/> over a time grid, segment by segment of the network's
/// <see cref="Timeline"/>, the same segments <see cref="RateEquationSolver"/> and the simulators use (a
/// grid point at a change's instant records the state after it). Readouts, their variances and their
/// corrected means read the parameter values in force at each point. At a change x_i ← f(x) (set), x_i + f(x) (add) or x_i − f(x) (subtract)
/// the fluctuations are mapped linearly: ξ ↦ M·ξ with M the identity except row i, which is ∇f (set),
/// e_i + ∇f (add) or e_i − ∇f (subtract); so C ↦ M·C·Mᵀ and δ ↦ M·δ. Adding or subtracting a constant
/// leaves C unchanged (a deterministic jump); setting a species to a constant zeroes its row and column.
/// A state-triggered change has no such rule here (its time depends on the fluctuations the expansion
/// describes): the integration stops at the first one, located on the dense output as for the rate
/// equations, and the solution says so (<see cref="SystemSizeExpansionSolution.StoppedAt"/>).
/// With the sources split, every jump map acts on C, C_r and C_p alike and a division's partitioning variance
/// enters C and C_p only (<see cref="ExpansionSystem"/>).
/// </summary>
internal static class ExpansionIntegration
{
    public static SystemSizeExpansionSolution Solve(ReactionNetwork network, TimeGrid grid, SolverOptions options, bool withMeanCorrection, IReadOnlyList<double>? parameterValues = null, bool splitSources = false)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Check() is { } problem) throw new ArgumentException(problem, nameof(options));
        ModelSupport.RequireRateEquations(network);

        var system = new ExpansionSystem(network, withMeanCorrection, splitSources);
        if (parameterValues is not null)
        {
            if (parameterValues.Count != network.Parameters.Count)
                throw new ArgumentException($"{parameterValues.Count} parameter values for {network.Parameters.Count} parameters", nameof(parameterValues));
            for (var p = 0; p < parameterValues.Count; p++) system.SetParameter(p, parameterValues[p]);
        }
        var s = system.SpeciesCount;
        var y = new double[system.Dimension];
        for (var i = 0; i < s; i++) y[i] = network.InitialAmounts[i]; // C(0) = 0 and δ(0) = 0: a deterministic start
        var states = new double[grid.Count][];
        // Readouts read the parameters in force at each point, so they are evaluated as the points are recorded.
        var columns = network.Species.Concat(network.Readouts.Select(r => r.Name)).ToArray();
        var rateEquations = new double[grid.Count, columns.Length];
        var variances = new double[grid.Count, columns.Length];
        var corrected = new double[grid.Count, columns.Length];
        // Per block (C, then C_r and C_p when split): the variances of species and readouts.
        var blocks = system.CovarianceBlocks;
        var blockVariances = blocks.Select(_ => new double[grid.Count, columns.Length]).ToArray();
        var covariance = new double[s, s];
        var blockCovariance = new double[s, s];
        var phi = new double[s];
        var gradient = new double[s];

        void Record(int point, double[] state)
        {
            states[point] = (double[])state.Clone();
            Array.Copy(state, phi, s);
            system.UnpackCovariance(state, covariance);
            var parameters = system.ParameterArray;
            for (var i = 0; i < s; i++)
            {
                rateEquations[point, i] = phi[i];
                variances[point, i] = covariance[i, i];
                corrected[point, i] = withMeanCorrection ? phi[i] + state[system.CorrectionOffset + i] : double.NaN;
            }
            for (var b = 1; b < blocks.Count; b++)
            {
                system.UnpackCovariance(state, blockCovariance, blocks[b]);
                for (var i = 0; i < s; i++) blockVariances[b][point, i] = blockCovariance[i, i];
            }
            for (var r = 0; r < network.Readouts.Count; r++)
            {
                var readout = network.Readouts[r];
                var column = s + r;
                rateEquations[point, column] = readout.OnState(phi, parameters);
                ReadoutLinearisation.Gradient(readout, phi, parameters, gradient);
                variances[point, column] = QuadraticForm(gradient, covariance);
                for (var b = 1; b < blocks.Count; b++)
                {
                    system.UnpackCovariance(state, blockCovariance, blocks[b]);
                    blockVariances[b][point, column] = QuadraticForm(gradient, blockCovariance);
                }
                if (!withMeanCorrection) { corrected[point, column] = double.NaN; continue; }
                var shift = 0.0;
                for (var i = 0; i < s; i++) shift += gradient[i] * state[system.CorrectionOffset + i];
                corrected[point, column] = rateEquations[point, column] + shift + ReadoutLinearisation.Curvature(readout, phi, parameters, covariance);
            }
        }

        var run = new OdeRun(system, options);
        var triggers = new RealStateTriggers(network, system.ParameterArray, (change, _) => Apply(change, y, system));
        var stoppedAt = TimelineIntegration.Run(run, Timeline.ForRateEquations(network, grid), y, change => Apply(change, y, system), Record, triggers, stopAtTrigger: true);
        var stoppedBy = double.IsFinite(stoppedAt) ? triggers.FirstTurningTrue(y) : null;
        // Grid times from the stop on are not integrated: NaN, so no value is mistaken for a solution.
        for (var point = 0; point < grid.Count; point++)
        {
            if (states[point] is not null) continue;
            states[point] = Enumerable.Repeat(double.NaN, system.Dimension).ToArray();
            for (var c = 0; c < columns.Length; c++)
            {
                rateEquations[point, c] = variances[point, c] = corrected[point, c] = double.NaN;
                for (var b = 1; b < blocks.Count; b++) blockVariances[b][point, c] = double.NaN;
            }
        }

        return new SystemSizeExpansionSolution(grid, columns, s, states, system.CorrectionOffset,
            rateEquations, variances, corrected, withMeanCorrection, run.Statistics)
        {
            StoppedAt = stoppedAt, StoppedBy = stoppedBy,
            Sources = splitSources ? new Noise.LnaNoiseSources(blockVariances[1], blockVariances[2], MaximumMismatch(states, system)) : null,
        };
    }

    // max |C − C_r − C_p| over the grid and entries, relative to max |C|: linearity makes it rounding (docs/methods-analysis.md §1).
    private static double MaximumMismatch(double[][] states, ExpansionSystem system)
    {
        var (largest, mismatch) = (0.0, 0.0);
        var size = system.PartitioningOffset - system.ReactionsOffset;
        foreach (var state in states)
            for (var p = 0; p < size; p++)
            {
                var total = state[system.CovarianceOffset + p];
                if (double.IsNaN(total)) continue;
                largest = Math.Max(largest, Math.Abs(total));
                mismatch = Math.Max(mismatch, Math.Abs(total - state[system.ReactionsOffset + p] - state[system.PartitioningOffset + p]));
            }
        return largest > 0 ? mismatch / largest : mismatch;
    }

    private static double QuadraticForm(double[] g, double[,] c)
    {
        var sum = 0.0;
        for (var i = 0; i < g.Length; i++)
        {
            if (g[i] == 0) continue;
            for (var j = 0; j < g.Length; j++) sum += g[i] * c[i, j] * g[j];
        }
        return sum;
    }

    private static void Apply(ScheduledChange change, double[] y, ExpansionSystem system)
    {
        var time = change.Time;
        var s = system.SpeciesCount;
        var parameters = system.ParameterArray;
        var phi = y.AsSpan(0, s).ToArray();
        var value = change.OnState(phi, parameters);
        var isSpecies = change.Target == ScheduleTarget.Species;
        var old = isSpecies ? phi[change.TargetIndex] : parameters[change.TargetIndex];
        var updated = change.Combine(old, value);
        var what = isSpecies ? $"species {change.TargetName}" : $"parameter {change.TargetName}";
        if (!double.IsFinite(updated))
            throw new SolverFailureException(time, what, $"the scheduled change gives the non-finite value {updated}");
        if (!isSpecies)
        {
            // A parameter change moves no molecule: φ, C and δ are continuous across it; the mean cell's division
            // starts with one (its birth time moving on), where the partitioning variance enters.
            if (system.Network.Cycle is { } cycle && change.TargetIndex == cycle.BirthSlot)
            {
                var before = new double[s, s];
                // The sharing of gene copies is partly a linear map of the covariance (every source's part) and partly an
                // injection (the whole and the partitioning's part only); DivisionVariance says why.
                foreach (var block in system.SplitsSources ? [system.CovarianceOffset, system.ReactionsOffset, system.PartitioningOffset] : new[] { system.CovarianceOffset })
                {
                    system.UnpackCovariance(y, before, block);
                    DivisionVariance.ShareGeneCopies(cycle, phi, before);
                    if (block != system.ReactionsOffset) DivisionVariance.AddBeforeHalving(system.Network, cycle, phi, before);
                    system.PackCovariance(before, y, block);
                }
            }
            system.SetParameter(change.TargetIndex, updated);
            return;
        }
        if (updated < 0 && updated < old)
            throw new SolverFailureException(time, what, $"the scheduled change makes the count negative ({updated:G6})");

        var target = change.TargetIndex;
        var row = ChangeRow(change, phi, parameters);
        y[target] = updated;

        var covariance = new double[s, s];
        var mc = new double[s];
        foreach (var block in system.CovarianceBlocks)
        {
            system.UnpackCovariance(y, covariance, block);
            // C ↦ M·C·Mᵀ with M = I except row `target`: only that row and column change.
            for (var j = 0; j < s; j++)
            {
                var sum = 0.0;
                for (var k = 0; k < s; k++) sum += row[k] * covariance[k, j];
                mc[j] = sum;
            }
            var corner = 0.0;
            for (var k = 0; k < s; k++) corner += mc[k] * row[k];
            for (var j = 0; j < s; j++) covariance[target, j] = covariance[j, target] = mc[j];
            covariance[target, target] = corner;
            system.PackCovariance(covariance, y, block);
        }

        if (!system.WithMeanCorrection) return;
        var offset = system.CorrectionOffset;
        var shifted = 0.0;
        for (var k = 0; k < s; k++) shifted += row[k] * y[offset + k];
        y[offset + target] = shifted;
    }

    // Row `target` of M, the gradient of the new value: the operations are linear in (old value, f), so
    // the row is the change's own Combine applied to the gradients e_target and ∇f, entry by entry (∇f for
    // set, e_target ± ∇f for add and subtract). ∇f by central differences, so a constant value (the usual
    // case) gives exactly 0.
    private static double[] ChangeRow(ScheduledChange change, double[] phi, double[] parameters)
    {
        var row = new double[phi.Length];
        CentralDifferences.Gradient(change.OnState, (double[])phi.Clone(), parameters, row);
        for (var k = 0; k < row.Length; k++) row[k] = change.Combine(k == change.TargetIndex ? 1.0 : 0.0, row[k]);
        return row;
    }
}
