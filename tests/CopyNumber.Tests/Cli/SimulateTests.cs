using System.Text.Json;
using CopyNumber.Storage;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

public class SimulateTests
{
    private const string ImmigrationDeath =
        "# illustrative: constant synthesis and first-order decay\nspecies\n  X = 0\nparameters\n  alpha = 10\n  mu = 1\nreactions\n  make: 0 -> X mass alpha\n  decay: X -> 0 mass mu\nreadouts\n  twice = 2 * X\n  half = X / 2\n";

    private static (CliRun Run, string Folder) Simulate(ScratchFolder scratch, string name, params string[] extra)
    {
        var model = scratch.File("immigration_death.cnet");
        if (!File.Exists(model)) File.WriteAllText(model, ImmigrationDeath);
        var folder = scratch.File(name);
        var args = new List<string> { "simulate", model, "--until", "5", "--every", "0.5", "--replicates", "4000", "--seed", "11", "--out", folder };
        args.AddRange(extra);
        return (CliRun.Of(args.ToArray()), folder);
    }

    [Theory]
    [InlineData("direct")]
    [InlineData("next-reaction")]
    [InlineData("tau-leap")]
    public void Immigration_death_moments_and_distributions_match_the_Poisson_law_at_every_time(string method)
    {
        using var scratch = new ScratchFolder();
        var (run, folder) = Simulate(scratch, "run", "--method", method);
        Assert.Equal(0, run.ExitCode);

        var moments = ParquetReadBack.Of(Path.Combine(folder, RunFiles.Moments));
        Assert.Equal(["time", "species", "replicates", "mean", "variance", "std_error", "fano", "cv2", "min",
            "q05", "q25", "median", "q75", "q95", "max", "p_zero", "deterministic"], moments.Names);
        var time = (double[])moments.Values[0];
        var species = (string[])moments.Values[1];
        var replicates = (long[])moments.Values[2];
        var mean = (double[])moments.Values[3];
        var stdError = (double[])moments.Values[5];
        var pZero = (double[])moments.Values[15];
        var deterministic = (double[])moments.Values[16];
        Assert.Equal(11 * 3, time.Length); // grid points × (species + two readouts)
        for (var row = 0; row < time.Length; row++)
        {
            if (species[row] != "X" || time[row] == 0) continue;
            Assert.Equal(4000, replicates[row]);
            // Immigration–death from X(0) = 0 is Poisson with mean (α/μ)(1 − e^(−μt)) at every t
            // (Bailey 1964, The Elements of Stochastic Processes, ch. 7), which is also the rate equation.
            var exact = 10 * (1 - Math.Exp(-time[row]));
            var se = Math.Sqrt(exact / 4000);
            Assert.True(Math.Abs(mean[row] - exact) < 5 * se, $"t = {time[row]}: mean {mean[row]} vs {exact} ± {se}");
            Assert.Equal(stdError[row], se, 0.2 * se);
            Assert.Equal(exact, deterministic[row], 1e-5);
            var p0 = Math.Exp(-exact);
            Assert.True(Math.Abs(pZero[row] - p0) < 5 * Math.Sqrt(p0 * (1 - p0) / 4000) + 1e-12, $"P(0) at t = {time[row]}");
        }

        // Chi-square of the final-time histogram against the Poisson pmf, cells pooled to expected ≥ 5; the
        // 0.9999 quantile of chi-square with ≤ 20 degrees of freedom is below 50 (Abramowitz & Stegun 26.4).
        var distributions = ParquetReadBack.Of(Path.Combine(folder, RunFiles.Distributions));
        var dTime = (double[])distributions.Values[0];
        var dSpecies = (string[])distributions.Values[1];
        var count = (long[])distributions.Values[2];
        var probability = (double[])distributions.Values[3];
        var observed = new Dictionary<long, double>();
        for (var row = 0; row < dTime.Length; row++)
            if (dTime[row] == 5 && dSpecies[row] == "X") observed[count[row]] = probability[row] * 4000;
        Assert.Equal(4000, observed.Values.Sum(), 1e-6);
        var lambda = 10 * (1 - Math.Exp(-5));
        var chiSquare = PooledChiSquare(observed, k => Math.Exp(-lambda + k * Math.Log(lambda) - LogFactorial(k)) * 4000, out var cells);
        Assert.InRange(cells, 5, 21);
        Assert.True(chiSquare < 50, $"chi-square {chiSquare} over {cells} cells");
    }

    [Fact]
    public void The_same_seed_gives_identical_summaries_and_paths_with_one_thread_and_with_two()
    {
        using var scratch = new ScratchFolder();
        var (one, folderOne) = Simulate(scratch, "one", "--threads", "1", "--paths", "70");
        var (two, folderTwo) = Simulate(scratch, "two", "--threads", "2", "--paths", "70");
        Assert.Equal(0, one.ExitCode);
        Assert.Equal(0, two.ExitCode);
        foreach (var file in new[] { RunFiles.Moments, RunFiles.Distributions, RunFiles.Paths })
        {
            var a = ParquetReadBack.Of(Path.Combine(folderOne, file));
            var b = ParquetReadBack.Of(Path.Combine(folderTwo, file));
            Assert.Equal(a.Names, b.Names);
            for (var c = 0; c < a.Values.Length; c++)
            {
                // Bitwise equality of every cell, doubles included (NaN == NaN bitwise).
                var left = a.Values[c];
                var right = b.Values[c];
                Assert.Equal(left.Length, right.Length);
                for (var i = 0; i < left.Length; i++)
                    Assert.True(Same(left.GetValue(i), right.GetValue(i)), $"{file} column {a.Names[c]} row {i}: {left.GetValue(i)} vs {right.GetValue(i)}");
            }
        }
        var paths = ParquetReadBack.Of(Path.Combine(folderOne, RunFiles.Paths));
        Assert.Equal(["replicate", "time", "X"], paths.Names);
        Assert.Equal(70 * 11, paths.TotalRows);
        Assert.Equal(Enumerable.Range(0, 70).SelectMany(r => Enumerable.Repeat((long)r, 11)).ToArray(), (long[])paths.Values[0]);
    }

    [Fact]
    public void The_manifest_records_the_seed_the_model_hash_and_the_work_done()
    {
        using var scratch = new ScratchFolder();
        var (run, folder) = Simulate(scratch, "run");
        Assert.Equal(0, run.ExitCode);
        using var manifest = JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, RunFiles.Manifest)));
        var root = manifest.RootElement;
        Assert.Equal(11UL, root.GetProperty("seed").GetUInt64());
        Assert.Equal(4000, root.GetProperty("replicates_finished").GetInt64());
        Assert.False(root.GetProperty("partial").GetBoolean());
        Assert.True(root.GetProperty("events_fired").GetInt64() > 4000);
        Assert.Equal(Provenance.Sha256Hex(ImmigrationDeath), root.GetProperty("model_sha256").GetString());
        Assert.Contains("X", run.Output);
        Assert.Contains("rate eq.", run.Output);
    }

    [Fact]
    public void Without_a_seed_one_is_drawn_and_recorded()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("m.cnet");
        File.WriteAllText(model, ImmigrationDeath);
        var folder = scratch.File("run");
        var run = CliRun.Of("simulate", model, "--until", "1", "--every", "0.5", "--replicates", "10", "--out", folder);
        Assert.Equal(0, run.ExitCode);
        var seed = RunManifest.Read(Path.Combine(folder, RunFiles.Manifest)).Seed;
        Assert.Contains($"seed {seed}", run.Error);
    }

    private static bool Same(object? a, object? b) => (a, b) switch
    {
        (double x, double y) => BitConverter.DoubleToInt64Bits(x) == BitConverter.DoubleToInt64Bits(y),
        _ => Equals(a, b),
    };

    /// <summary>Pearson's chi-square with cells pooled left to right until each expects at least 5; the last cell takes the whole upper tail.</summary>
    private static double PooledChiSquare(Dictionary<long, double> observed, Func<long, double> expected, out int cells)
    {
        var total = observed.Values.Sum();
        var cellObserved = new List<double>();
        var cellExpected = new List<double>();
        double o = 0, e = 0, expectedSoFar = 0;
        for (long k = 0; total - expectedSoFar >= 5; k++)
        {
            var ek = expected(k);
            o += observed.GetValueOrDefault(k);
            e += ek;
            expectedSoFar += ek;
            if (e < 5) continue;
            cellObserved.Add(o);
            cellExpected.Add(e);
            o = 0;
            e = 0;
        }
        // Everything not yet in a cell, observed and expected, goes into the last cell.
        var restObserved = total - cellObserved.Sum();
        var restExpected = total - cellExpected.Sum();
        cellObserved[^1] += restObserved;
        cellExpected[^1] += restExpected;
        cells = cellObserved.Count;
        return cellObserved.Zip(cellExpected).Sum(c => (c.First - c.Second) * (c.First - c.Second) / c.Second);
    }

    private static double LogFactorial(long k)
    {
        var sum = 0.0;
        for (var j = 2; j <= k; j++) sum += Math.Log(j);
        return sum;
    }
}
