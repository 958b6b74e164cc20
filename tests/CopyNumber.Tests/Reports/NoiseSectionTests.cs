using System.Globalization;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Ensembles;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// The contrast report's noise section (issue 13: "the report says how much of each quantity's variance is
/// intrinsic, extrinsic ..., with errors"), run through the real command line. Immigration–death with a
/// gamma-distributed immigration rate k (mean m, CV c) from X(0) = 0: given k, X(t) is Poisson with mean
/// k·u, u = (1 − e^(−dt))/d (Bailey 1964, quoted from memory), so by the law of total variance the squared
/// CV splits into the intrinsic part 1/⟨x⟩ and the extrinsic part c² (Swain, Elowitz &amp; Siggia 2002,
/// PNAS 99:12795; common practice). The exact values are computed here.
/// </summary>
public sealed class NoiseSectionTests
{
    private const double Mean = ExtrinsicVariabilityTests.Mean, Cv = ExtrinsicVariabilityTests.Cv, Death = ExtrinsicVariabilityTests.Death, Until = ExtrinsicVariabilityTests.Until;

    [Fact]
    public void The_report_splits_the_noise_into_its_exact_intrinsic_and_extrinsic_parts_within_the_errors_it_prints()
    {
        var folder = Path.Combine(Path.GetTempPath(), $"copynumber-noise-{Guid.NewGuid():N}");
        Directory.CreateDirectory(folder);
        var model = Path.Combine(folder, "varying_immigration.cnet");
        File.WriteAllText(model, ExtrinsicVariabilityTests.ModelText);
        try
        {
            var run = CliRun.Of("simulate", model, "--until", "4", "--every", "2", "--replicates", "16000", "--seed", "2002", "--out", Path.Combine(folder, "run"));
            Assert.True(run.ExitCode == 0, run.Error);
            var report = File.ReadAllText(Path.Combine(folder, "run", "report.md"));
            Assert.Contains("## Noise: intrinsic and extrinsic", report);
            var row = report.Split('\n').Single(l => l.StartsWith("| X | cells | 4 |", StringComparison.Ordinal));
            var cells = row.Split('|', StringSplitOptions.TrimEntries)[1..^1];
            var (intrinsic, intrinsicSe) = ValueAndError(cells[4]);
            var (extrinsic, extrinsicSe) = ValueAndError(cells[5]);
            var x = Mean * (1 - Math.Exp(-Death * Until)) / Death;
            // Five printed standard errors: a false failure has probability below 10⁻⁶ per part (normal tail).
            Assert.True(Math.Abs(intrinsic - 1 / x) <= 5 * intrinsicSe, $"intrinsic CV² {intrinsic} ± {intrinsicSe}, exact {1 / x}");
            Assert.True(Math.Abs(extrinsic - Cv * Cv) <= 5 * extrinsicSe, $"extrinsic CV² {extrinsic} ± {extrinsicSe}, exact {Cv * Cv}");
            // The errors are small enough for the check to mean something: each part resolved to 20%.
            Assert.True(intrinsicSe < 0.2 / x && extrinsicSe < 0.2 * Cv * Cv, row);
            var share = double.Parse(cells[6].Replace("\\", "", StringComparison.Ordinal).TrimEnd('%'), CultureInfo.InvariantCulture) / 100;
            Assert.InRange(share, 0.6, 0.95); // exact c²/(1/x + c²) = 0.83
            Assert.Contains("noise-split.png", report);

            // The LNA over the run's first 200 cells predicts the same split in variance units: for this linear network each
            // cell's LNA is exact (Poisson with mean k·u), so the intrinsic part is E[k]·u = x and the extrinsic part
            // Var(k)·u² = (x·c)² (law of total variance), up to the Monte Carlo error over 200 gamma draws.
            var split = report.Split('\n').Where(l => l.StartsWith("| X | ", StringComparison.Ordinal))
                .Select(l => l.Split('|', StringSplitOptions.TrimEntries)[1..^1]).Single(c => c.Length == 7 && c[1] != "cells");
            var (lnaIntrinsic, lnaIntrinsicSe) = ValueAndError(split[2]);
            var (lnaExtrinsic, lnaExtrinsicSe) = ValueAndError(split[5]);
            Assert.True(Math.Abs(lnaIntrinsic - x) <= 5 * lnaIntrinsicSe, $"LNA intrinsic {lnaIntrinsic} ± {lnaIntrinsicSe}, exact {x}");
            Assert.True(Math.Abs(lnaExtrinsic - x * x * Cv * Cv) <= 5 * lnaExtrinsicSe, $"LNA extrinsic {lnaExtrinsic} ± {lnaExtrinsicSe}, exact {x * x * Cv * Cv}");
            Assert.True(lnaExtrinsicSe < 0.3 * x * x * Cv * Cv, split[5]);
            Assert.EndsWith("(within error)", split[3], StringComparison.Ordinal);
            Assert.EndsWith("(within error)", split[6], StringComparison.Ordinal);
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    [Fact]
    public void Dual_reporters_under_a_shared_fluctuating_factor_give_the_exact_intrinsic_and_extrinsic_noise()
    {
        // Elowitz, Levine, Siggia & Swain (2002, Science 297:1183): two identical reporters c and y made at rate k·F from a
        // shared factor F (itself made at kf, lost at gf) and lost at g. The network is linear, so its stationary covariance
        // solves the Lyapunov equation A·Σ + Σ·Aᵀ + B = 0 exactly (moment equations close for linear propensities; common
        // practice, e.g. Elf & Ehrenberg 2003, Genome Res. 13:2475), solved here. The identities give
        // η²_int = (Var c − Cov(c, y))/c̄² and η²_ext = Cov(c, y)/c̄²; by hand (Swain et al. 2002) 1/c̄ and (1/F̄)·g/(g + gf).
        const double kf = 5, gf = 0.5, k = 1, g = 0.5;
        var folder = Path.Combine(Path.GetTempPath(), $"copynumber-reporters-{Guid.NewGuid():N}");
        Directory.CreateDirectory(folder);
        var model = Path.Combine(folder, "two_reporters.cnet");
        File.WriteAllText(model, $"""
            # two identical reporters driven by one fluctuating factor; illustrative
            species
              F = 10
              c = 20
              y = 20
            parameters
              kf = {kf}
              gf = {gf}
              k = {k}
              g = {g}
            reactions
              factor_made: 0 -> F      mass kf
              factor_lost: F -> 0      mass gf
              c_made:      F -> F + c  mass k
              c_lost:      c -> 0      mass g
              y_made:      F -> F + y  mass k
              y_lost:      y -> 0      mass g
            """);
        try
        {
            var run = CliRun.Of("simulate", model, "--until", "60", "--every", "30", "--replicates", "8000", "--seed", "2002",
                "--dual-reporters", "c:y", "--out", Path.Combine(folder, "run"));
            Assert.True(run.ExitCode == 0, run.Error);
            var (factor, reporter) = (kf / gf, k * (kf / gf) / g);
            var a = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.DenseOfArray(new[,] { { -gf, 0, 0 }, { k, -g, 0 }, { k, 0, -g } });
            var b = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.DenseDiagonal(3, 3, i => i == 0 ? kf + gf * factor : k * factor + g * reporter);
            var sigma = Lyapunov(a, b);
            var exactIntrinsic = (sigma[1, 1] - sigma[1, 2]) / (reporter * reporter);
            var exactExtrinsic = sigma[1, 2] / (reporter * reporter);
            // The Lyapunov solution against the closed forms by hand: both parts 0.05 for these values.
            Assert.Equal(1 / reporter, exactIntrinsic, 12);
            Assert.Equal(1 / factor * g / (g + gf), exactExtrinsic, 12);

            var report = File.ReadAllText(Path.Combine(folder, "run", "report.md"));
            var row = report.Split('\n').Single(l => l.StartsWith("| c:y | reporters | 60 |", StringComparison.Ordinal));
            var cells = row.Split('|', StringSplitOptions.TrimEntries)[1..^1];
            var (intrinsic, intrinsicSe) = ValueAndError(cells[4]);
            var (extrinsic, extrinsicSe) = ValueAndError(cells[5]);
            // Five printed standard errors (normal tail below 10⁻⁶ per part), and errors small enough to mean something.
            Assert.True(Math.Abs(intrinsic - exactIntrinsic) <= 5 * intrinsicSe, $"intrinsic {intrinsic} ± {intrinsicSe}, exact {exactIntrinsic}");
            Assert.True(Math.Abs(extrinsic - exactExtrinsic) <= 5 * extrinsicSe, $"extrinsic {extrinsic} ± {extrinsicSe}, exact {exactExtrinsic}");
            Assert.True(intrinsicSe < 0.1 * exactIntrinsic && extrinsicSe < 0.2 * exactExtrinsic, row);
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    [Fact]
    public void A_reporter_that_is_not_a_species_is_refused_before_the_run()
    {
        var run = CliRun.Of("simulate", CliRun.Scenario("toggle_pair.cnet"), "--until", "1", "--every", "1", "--replicates", "10", "--dual-reporters", "U:W");
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("'W' is not a species", run.Error);
        Assert.DoesNotContain("   at ", run.Error);
    }

    // Σ from A·Σ + Σ·Aᵀ = −B, vectorised: (I ⊗ A + A ⊗ I)·vec Σ = −vec B (common practice).
    private static MathNet.Numerics.LinearAlgebra.Matrix<double> Lyapunov(MathNet.Numerics.LinearAlgebra.Matrix<double> a, MathNet.Numerics.LinearAlgebra.Matrix<double> b)
    {
        var n = a.RowCount;
        var identity = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.DenseIdentity(n);
        var system = identity.KroneckerProduct(a) + a.KroneckerProduct(identity);
        var solution = system.Solve(-MathNet.Numerics.LinearAlgebra.Vector<double>.Build.DenseOfEnumerable(b.EnumerateColumns().SelectMany(c => c)));
        return MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.Dense(n, n, (i, j) => solution[j * n + i]);
    }

    [Fact]
    public void The_rate_equations_of_the_average_cell_describe_the_mean_where_those_of_the_mean_cell_do_not()
    {
        // Immigration at k and loss at a rate d that differs from cell to cell, gamma with mean 1 and CV 0.5, from X = 0:
        // each cell follows x(t; d) = (k/d)(1 − e^(−d·t)) exactly in the mean (a linear network), so the population mean is
        // E_d[x(t; d)] (law of total expectation, common practice), computed here by quadrature over the gamma law, while
        // the mean cell gives x(t; 1). At t = 50, E[k/d] = k/(1 − CV²) = 26.7 against 20 (gamma moments, common practice).
        const double k = 20, cv = 0.5, until = 50;
        var folder = Path.Combine(Path.GetTempPath(), $"copynumber-average-cell-{Guid.NewGuid():N}");
        Directory.CreateDirectory(folder);
        var model = Path.Combine(folder, "varying_loss.cnet");
        File.WriteAllText(model, $"""
            # immigration with a loss rate that differs from cell to cell; illustrative
            species
              X = 0
            parameters
              k = {k}
              d = 1  varies gamma cv {cv}
            reactions
              arrive: 0 -> X  mass k
              leave:  X -> 0  mass d
            """);
        try
        {
            var run = CliRun.Of("simulate", model, "--until", "50", "--every", "25", "--replicates", "8000", "--seed", "11", "--out", Path.Combine(folder, "run"));
            Assert.True(run.ExitCode == 0, run.Error);
            var shape = 1 / (cv * cv);
            var gamma = new MathNet.Numerics.Distributions.Gamma(shape, shape); // rate = shape: mean 1
            var exact = MathNet.Numerics.Integrate.OnClosedInterval(
                d => gamma.Density(d) * k / d * (1 - Math.Exp(-d * until)), 1e-9, 30, 1e-10);
            Assert.InRange(exact, 26.0, 26.7); // by hand: just below k/(1 − CV²) = 26.67, the transient of the slowest cells

            var report = File.ReadAllText(Path.Combine(folder, "run", "report.md")).Replace("\\", "", StringComparison.Ordinal);
            var cells = report.Split('\n').Where(l => l.StartsWith("| X | ", StringComparison.Ordinal))
                .Select(l => l.Split('|', StringSplitOptions.TrimEntries)[1..^1]).Single(c => c.Length == 6 && c[3].EndsWith(")", StringComparison.Ordinal)); // the mean cell against the average of cells
            var (mean, meanSe) = ValueAndError(cells[1]);
            Assert.Equal(20, double.Parse(cells[2], CultureInfo.InvariantCulture), 6);
            Assert.EndsWith("(resolved)", cells[3], StringComparison.Ordinal);
            var (average, averageSe) = ValueAndError(cells[4]);
            Assert.EndsWith("(within error)", cells[5], StringComparison.Ordinal);
            // The ensemble and the average of the run's first 200 cells both estimate the exact population mean.
            Assert.True(Math.Abs(mean - exact) <= 5 * meanSe, $"ensemble mean {mean} ± {meanSe}, exact {exact}");
            Assert.True(Math.Abs(average - exact) <= 5 * averageSe, $"average of cells {average} ± {averageSe}, exact {exact}");
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    // "0.2513 ± 0.0112", with the Markdown escapes of the report removed.
    private static (double Value, double Error) ValueAndError(string cell)
    {
        var parts = cell.Replace("\\", "", StringComparison.Ordinal).Split('±', StringSplitOptions.TrimEntries);
        return (double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture));
    }
}
