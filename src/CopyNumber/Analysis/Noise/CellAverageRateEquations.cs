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
    /// <param name="network">The compiled network, some of whose parameters vary per cell.</param>
    /// <param name="grid">Recording times, model time units.</param>
    /// <param name="options">The integrator's settings.</param>
    /// <param name="seed">The run's seed: cell d has the run's draw d.</param>
    /// <param name="draws">Cells averaged, at least 2.</param>
    /// <param name="withNoise">Also solve each cell's linear noise approximation and split the variance it predicts by the law of
    /// total variance (<see cref="CellAverage.Intrinsic"/>, <see cref="CellAverage.Extrinsic"/>); the cells' means then come from
    /// the same integration as their variances.</param>
    /// <exception cref="SolverFailureException">The rate equations (or the LNA) failed for some cell's parameters.</exception>
    /// <exception cref="AnalysisInputException">The LNA cannot describe the network (only with <paramref name="withNoise"/>).</exception>
    public static CellAverage Solve(ReactionNetwork network, TimeGrid grid, SolverOptions options, ulong seed, int draws = Draws, bool withNoise = false)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentOutOfRangeException.ThrowIfLessThan(draws, 2);
        string[]? columns = null;
        CellMoments? means = null, variances = null;
        var parameters = new double[network.Parameters.Count];
        for (var d = 0; d < draws; d++)
        {
            for (var p = 0; p < parameters.Length; p++) parameters[p] = network.InitialParameterValues[p];
            network.Variability.Draw(seed, d, parameters);
            if (withNoise)
            {
                var lna = LinearNoiseApproximation.Solve(network, grid, options, parameters);
                columns ??= [.. lna.Columns];
                means ??= new CellMoments(grid.Count, columns.Length);
                variances ??= new CellMoments(grid.Count, columns.Length);
                means.Add(lna.RateEquationValue);
                variances.Add(lna.Variance);
            }
            else
            {
                var solution = RateEquationSolver.Solve(network, grid, options, parameters);
                columns ??= [.. solution.Columns];
                means ??= new CellMoments(grid.Count, columns.Length);
                means.Add((k, c) => solution[k, c]);
            }
        }
        var (mean, error) = means!.Average();
        if (variances is null) return new CellAverage(columns!, mean, error, draws);
        // Law of total variance over cells (Swain, Elowitz & Siggia 2002, PNAS 99:12795): within each cell the LNA's
        // variance is the intrinsic part, and the spread of the cells' rate-equation solutions is the extrinsic part.
        var (intrinsic, intrinsicError) = variances.Average();
        var (extrinsic, extrinsicError, kurtosis) = means.Spread();
        return new CellAverage(columns!, mean, error, draws)
        {
            Intrinsic = intrinsic, IntrinsicStandardError = intrinsicError, Extrinsic = extrinsic, ExtrinsicStandardError = extrinsicError,
            ExtrinsicKurtosis = kurtosis,
        };
    }

    /// <summary>
    /// Central moments (to the fourth) of one value per grid point and column over the cells, updated one cell at a time by
    /// the one-pass formulas of Pébay (2008, Sandia report SAND2008-6212), which keep a spread small beside the mean and need
    /// no memory per cell.
    /// </summary>
    private sealed class CellMoments(int points, int columns)
    {
        private readonly double[,] _mean = new double[points, columns];
        private readonly double[,] _m2 = new double[points, columns];
        private readonly double[,] _m3 = new double[points, columns];
        private readonly double[,] _m4 = new double[points, columns];
        private long _n;

        public void Add(Func<int, int, double> value)
        {
            var previous = _n;
            var n = ++_n;
            for (var k = 0; k < points; k++)
                for (var c = 0; c < columns; c++)
                {
                    var delta = value(k, c) - _mean[k, c];
                    var deltaN = delta / n;
                    var deltaN2 = deltaN * deltaN;
                    var term = delta * deltaN * previous;
                    _mean[k, c] += deltaN;
                    _m4[k, c] += term * deltaN2 * (n * n - 3 * n + 3) + 6 * deltaN2 * _m2[k, c] - 4 * deltaN * _m3[k, c];
                    _m3[k, c] += term * deltaN * (n - 2) - 3 * deltaN * _m2[k, c];
                    _m2[k, c] += term;
                }
        }

        /// <summary>The average over the cells and its Monte Carlo standard error.</summary>
        public (double[,] Mean, double[,] StandardError) Average()
        {
            var mean = (double[,])_mean.Clone();
            var error = new double[points, columns];
            for (var k = 0; k < points; k++)
                for (var c = 0; c < columns; c++) error[k, c] = Math.Sqrt(_m2[k, c] / (_n - 1) / _n);
            return (mean, error);
        }

        /// <summary>
        /// The unbiased sample variance over the cells and its standard error, sqrt((m₄ − m₂²)/n) with m₂, m₄ the central
        /// moments (the large-sample variance of a sample variance; common practice, e.g. Kendall &amp; Stuart, The Advanced
        /// Theory of Statistics, vol. 1, quoted from memory).
        /// </summary>
        public (double[,] Variance, double[,] StandardError, double[,] Kurtosis) Spread()
        {
            var variance = new double[points, columns];
            var error = new double[points, columns];
            var kurtosis = new double[points, columns];
            for (var k = 0; k < points; k++)
                for (var c = 0; c < columns; c++)
                {
                    variance[k, c] = _m2[k, c] / (_n - 1);
                    var (m2, m4) = (_m2[k, c] / _n, _m4[k, c] / _n);
                    error[k, c] = Math.Sqrt(Math.Max(0.0, m4 - m2 * m2) / _n);
                    kurtosis[k, c] = m2 > 0 ? m4 / (m2 * m2) : double.NaN;
                }
            return (variance, error, kurtosis);
        }
    }
}

/// <summary>The rate equations averaged over cells: per grid point and column (species, then readouts) the average and its Monte Carlo standard error.</summary>
/// <param name="Columns">Species then readouts, as in <see cref="DeterministicSolution.Columns"/>.</param>
/// <param name="Mean">Average over the cells, copies (or the readout's unit).</param>
/// <param name="StandardError">Standard error of that average over the finite number of cells.</param>
/// <param name="Draws">Cells averaged.</param>
public sealed record CellAverage(IReadOnlyList<string> Columns, double[,] Mean, double[,] StandardError, int Draws)
{
    /// <summary>
    /// The intrinsic part of the variance the LNA predicts, E_θ[Σ(θ)]: the average over the cells of each cell's LNA variance
    /// (copies², or the readout's unit squared); null unless asked for.
    /// </summary>
    public double[,]? Intrinsic { get; init; }

    /// <summary>Monte Carlo standard error of <see cref="Intrinsic"/>.</summary>
    public double[,]? IntrinsicStandardError { get; init; }

    /// <summary>The extrinsic part, Var_θ[φ(θ)]: the variance over the cells of their rate-equation solutions (unbiased); null unless asked for.</summary>
    public double[,]? Extrinsic { get; init; }

    /// <summary>
    /// Monte Carlo standard error of <see cref="Extrinsic"/>, from the cells' sample fourth moment: it understates the
    /// uncertainty when the cells' solutions are heavy-tailed (see <see cref="ExtrinsicKurtosis"/>).
    /// </summary>
    public double[,]? ExtrinsicStandardError { get; init; }

    /// <summary>
    /// The sample kurtosis m₄/m₂² of the cells' rate-equation solutions (3 for a normal law). Far above 3 the fourth moment
    /// that <see cref="ExtrinsicStandardError"/> rests on is poorly estimated by a few hundred cells (e.g. k/d with d gamma of
    /// shape 4 has kurtosis about 46 at t = 50 from 0 with k = 20); see <see cref="HeavyTailKurtosis"/>.
    /// </summary>
    public double[,]? ExtrinsicKurtosis { get; init; }

    /// <summary>
    /// Sample kurtosis above which the report cautions that the cells' spread and its error may be unreliable: 6, twice the
    /// normal law's (ours). Measured by simulation over 2 000 sets of 200 cells: for k/d with d gamma of shape 4 (true
    /// kurtosis ≈ 46, the standard error of the spread 165 against 346) the sample kurtosis has quartiles 8.9, 13.0, 20.5,
    /// so 6 catches it in about 95% of sets; a gamma law of shape 4 (kurtosis 4.5) stays below it in about 90%. A lognormal
    /// law of CV 0.5 (kurtosis 8) is cautioned about too: its error is usable but rests on a moment few cells estimate well.
    /// </summary>
    public const double HeavyTailKurtosis = 6;

    /// <summary>The column of <paramref name="name"/>, or −1.</summary>
    public int ColumnIndex(string name)
    {
        for (var c = 0; c < Columns.Count; c++) if (Columns[c] == name) return c;
        return -1;
    }
}
