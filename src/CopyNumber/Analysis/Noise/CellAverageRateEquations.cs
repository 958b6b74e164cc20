using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Analysis.Noise;

/// <summary>
/// The rate equations of "the average of cells" beside those of "the mean cell": when parameters vary from cell
/// to cell, the ensemble mean is E_θ[x(t; θ)] in the deterministic limit, which differs from x(t; E[θ]) whenever
/// x depends nonlinearly on θ (Jensen's inequality; e.g. a steady state k/d with d varying). This solves the rate
/// equations once per cell for the first <see cref="Draws"/> parameter draws of the run (the same draws, by the same
/// key, as the ensemble's cells: <see cref="ParameterVariability.Draw"/>) and averages them, with the Monte Carlo
/// standard error of that average.
/// </summary>
public static class CellAverageRateEquations
{
    /// <summary>Number of cells averaged: the first 200 draws of the run (docs/methods.md, "Extrinsic variability").</summary>
    public const int Draws = 200;

    /// <summary>The average over the first <paramref name="draws"/> cells of the run seeded <paramref name="seed"/>.</summary>
    /// <exception cref="SolverFailureException">The rate equations failed for some cell's parameters.</exception>
    public static CellAverage Solve(ReactionNetwork network, TimeGrid grid, SolverOptions options, ulong seed, int draws = Draws)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentOutOfRangeException.ThrowIfLessThan(draws, 2);
        string[]? columns = null;
        double[,]? sum = null, sumOfSquares = null;
        var parameters = new double[network.Parameters.Count];
        for (var d = 0; d < draws; d++)
        {
            for (var p = 0; p < parameters.Length; p++) parameters[p] = network.InitialParameterValues[p];
            network.Variability.Draw(seed, d, parameters);
            var solution = RateEquationSolver.Solve(network, grid, options, parameters);
            columns ??= [.. solution.Columns];
            sum ??= new double[grid.Count, columns.Length];
            sumOfSquares ??= new double[grid.Count, columns.Length];
            for (var k = 0; k < grid.Count; k++)
                for (var c = 0; c < columns.Length; c++)
                {
                    var x = solution[k, c];
                    sum[k, c] += x;
                    sumOfSquares[k, c] += x * x;
                }
        }
        var mean = new double[grid.Count, columns!.Length];
        var error = new double[grid.Count, columns.Length];
        for (var k = 0; k < grid.Count; k++)
            for (var c = 0; c < columns.Length; c++)
            {
                mean[k, c] = sum![k, c] / draws;
                var variance = Math.Max(0.0, (sumOfSquares![k, c] - draws * mean[k, c] * mean[k, c]) / (draws - 1));
                error[k, c] = Math.Sqrt(variance / draws);
            }
        return new CellAverage(columns, mean, error, draws);
    }
}

/// <summary>The rate equations averaged over cells: per grid point and column (species, then readouts) the average and its Monte Carlo standard error.</summary>
/// <param name="Columns">Species then readouts, as in <see cref="DeterministicSolution.Columns"/>.</param>
/// <param name="Mean">Average over the cells, copies (or the readout's unit).</param>
/// <param name="StandardError">Standard error of that average over the finite number of cells.</param>
/// <param name="Draws">Cells averaged.</param>
public sealed record CellAverage(IReadOnlyList<string> Columns, double[,] Mean, double[,] StandardError, int Draws)
{
    /// <summary>The column of <paramref name="name"/>, or −1.</summary>
    public int ColumnIndex(string name)
    {
        for (var c = 0; c < Columns.Count; c++) if (Columns[c] == name) return c;
        return -1;
    }
}
