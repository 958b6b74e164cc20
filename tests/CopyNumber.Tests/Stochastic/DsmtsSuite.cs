using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The Discrete Stochastic Models Test Suite (Evans, Gillespie &amp; Wilkinson 2008, Bioinformatics 24:285),
/// as distributed in the SBML Test Suite's stochastic cases 00001–00039. The models are encoded here in
/// our own language from the published model descriptions (NNNNN-model.m: reactions, rates, initial
/// values, events); only the expected means and standard deviations (NNNNN-results.csv) and the
/// acceptance ranges (NNNNN-settings.txt) are read, in place, at test time from
/// ../shared/sbml-test-cases beside the repository. Nothing of the suite is copied into the repository.
/// </summary>
/// <remarks>
/// Each case folder also holds the original DSMTS tables (dsmts-*-mean.csv, -sd.csv). They agree with
/// NNNNN-results.csv to 10⁻⁶ SD in every case but 00033, where the DSMTS file's values after the first
/// resets differ by up to 0.044 SD (mean of P2 at t = 40: 20.259 against 19.997). The SBML Test Suite's
/// own table is the exact solution: the 31-state Markov chain on P2 (P = 100 − 2·P2, the step 30 → 31
/// taken to 0) solved by uniformisation outside the project gives 18.528, 19.997 and 20.849 for the mean
/// of P2 at t = 20, 40, 50, equal to NNNNN-results.csv to the digits shown, and the simulators agree with
/// it at 10 000 replicates while the DSMTS file is off by up to 4 standard errors. So results.csv is read.
/// </remarks>
/// <remarks>
/// Encoding notes: mass action here is a(x) = k·ff(x, ν) at size 1, so the suite's dimerisation rate
/// k1·P(P − 1)/2 is <c>mass k1/2</c>. A boundary species (00006, 00024, 00026 Sink; 00024–00026
/// Source) never changes, so it is left out of the reaction; the suite's expected values for it are
/// then checked to be the constant 0 (<see cref="Expected.ConstantColumns"/>). Species used "as
/// concentrations" in a compartment of volume 2 (00011), or rates multiplied by a volume of 0.5 (00018),
/// halve the propensities. The assignment rule y = 2X (00019) is an integer readout.
/// 00033's reset is triggered by a count (P2 &gt; 30): a <c>whenever</c> line. Every case 00001–00039 is encoded.
/// </remarks>
internal static class DsmtsSuite
{
    /// <summary>Case number → the model in our language.</summary>
    public static readonly IReadOnlyDictionary<int, string> Models = BuildModels();

    private static Dictionary<int, string> BuildModels()
    {
        static string BirthDeath(long x0, double lambda, double mu, string extraSpecies = "", string deathProduct = "0", string readouts = "") =>
            $"species\n  X = {x0}\n{extraSpecies}reactions\n  birth: X -> 2 X mass {F(lambda)}\n  death: X -> {deathProduct} mass {F(mu)}\n{readouts}";
        static string ImmigrationDeath(double alpha, double mu, string extraSpecies = "", string deathProduct = "0", int burst = 1, string schedule = "") =>
            $"species\n  X = 0\n{extraSpecies}reactions\n  immigration: 0 -> {(burst == 1 ? "" : burst + " ")}X mass {F(alpha)}\n  death: X -> {deathProduct} mass {F(mu)}\n{schedule}";
        static string Dimerisation(long p0, double k1, double k2, string schedule = "") =>
            $"species\n  P = {p0}\n  P2 = 0\nreactions\n  dimerisation: 2 P -> P2 mass {F(k1 / 2)}\n  disassociation: P2 -> 2 P mass {F(k2)}\n{schedule}";
        static string Reduced(string law) =>
            $"species\n  P2 = 0\nreactions\n  dimerisation: 0 -> P2 rate {law}\n  disassociation: P2 -> 0 mass 0.01\n";

        var models = new Dictionary<int, string>();
        foreach (var c in new[] { 1, 2, 8, 9, 10, 12, 13, 14, 15, 16, 17 }) models[c] = BirthDeath(100, 0.1, 0.11);
        models[3] = BirthDeath(100, 1, 1.1);
        models[4] = BirthDeath(10, 0.1, 0.11);
        models[5] = BirthDeath(10_000, 0.1, 0.11);
        models[6] = BirthDeath(100, 0.1, 0.11);
        models[7] = BirthDeath(100, 0.1, 0.11, extraSpecies: "  Sink = 0\n", deathProduct: "Sink");
        models[11] = BirthDeath(100, 0.05, 0.055);
        models[18] = BirthDeath(100, 0.05, 0.055);
        models[19] = BirthDeath(100, 0.1, 0.11, readouts: "readouts\n  y = 2 * X\n");
        models[20] = ImmigrationDeath(1, 0.1);
        models[21] = ImmigrationDeath(10, 0.1);
        models[22] = ImmigrationDeath(5, 0.1);
        models[23] = ImmigrationDeath(1000, 0.1);
        models[24] = ImmigrationDeath(10, 0.1);
        models[25] = ImmigrationDeath(10, 0.1, extraSpecies: "  Sink = 0\n", deathProduct: "Sink");
        models[26] = ImmigrationDeath(10, 0.1);
        models[27] = ImmigrationDeath(1, 0.1);
        models[28] = ImmigrationDeath(1, 0.1, schedule: "changes\n  X = 50  at time 25\n");
        models[29] = ImmigrationDeath(1, 0.1, schedule: "changes\n  X = 20  at time 22.5\n");
        models[30] = Dimerisation(100, 0.001, 0.01);
        models[31] = Dimerisation(1000, 0.0002, 0.004);
        models[32] = Dimerisation(100, 0.001, 0.01, schedule: "changes\n  P = 100, P2 = 0  at time 25\n");
        // 00033 (dsmts-003-04): 00032's reset triggered by the count, P2 > 30, instead of the time.
        models[33] = Dimerisation(100, 0.001, 0.01, schedule: "changes\n  P = 100, P2 = 0  whenever P2 > 30\n");
        models[34] = Reduced("0.5 * 0.001 * (100 - 2 * P2) * (99 - 2 * P2)");
        models[35] = Reduced("(0.001 * (100 - 2 * P2) * (100 - 2 * P2 - 1)) / 2");
        models[36] = Reduced("(0.001 * (100 - 2 * P2) * ((100 - 2 * P2) - 1)) / 2");
        models[37] = ImmigrationDeath(1, 0.2, burst: 5);
        models[38] = ImmigrationDeath(1, 0.4, burst: 10);
        models[39] = ImmigrationDeath(1, 4, burst: 100);
        return models;
    }

    private static string F(double value) => value.ToString("R", CultureInfo.InvariantCulture);

    /// <summary>The compiled network of case <paramref name="number"/>.</summary>
    public static ReactionNetwork Network(int number) =>
        ModelLoader.LoadText("# encoded from the DSMTS model description\n" + Models[number], $"dsmts-{number:D5}.cnet").Model!.Network;

    /// <summary>
    /// The folder of the SBML Test Suite's cases: ../shared/sbml-test-cases beside the repository root
    /// (the folder holding CopyNumber.sln). Fails the test, with the place looked at, when it is absent:
    /// a missing reference must never pass silently.
    /// </summary>
    public static string CasesFolder()
    {
        var directory = new DirectoryInfo(AppContext.BaseDirectory);
        while (directory is not null && !File.Exists(Path.Combine(directory.FullName, "CopyNumber.sln"))) directory = directory.Parent;
        Assert.True(directory is not null, $"no CopyNumber.sln above {AppContext.BaseDirectory}: cannot locate the repository root");
        var folder = Path.GetFullPath(Path.Combine(directory!.FullName, "..", "shared", "sbml-test-cases", "stochastic"));
        Assert.True(Directory.Exists(folder),
            $"the Discrete Stochastic Models Test Suite was not found at {folder}; it must be checked out at ../shared/sbml-test-cases beside the repository (as in CI)");
        return folder;
    }

    /// <summary>The expected means and standard deviations of case <paramref name="number"/> and its acceptance ranges.</summary>
    public static Expected Load(int number)
    {
        var folder = Path.Combine(CasesFolder(), number.ToString("D5", CultureInfo.InvariantCulture));
        var settings = File.ReadAllLines(Path.Combine(folder, $"{number:D5}-settings.txt"));
        var (table, headers, times) = ReadTable(Path.Combine(folder, $"{number:D5}-results.csv"));
        // Columns "<variable>-mean" and "<variable>-sd", one pair per variable.
        var columns = headers.Where(h => h.EndsWith("-mean", StringComparison.Ordinal)).Select(h => h[..^"-mean".Length]).ToArray();
        var means = new double[times.Length, columns.Length];
        var sds = new double[times.Length, columns.Length];
        for (var c = 0; c < columns.Length; c++)
        {
            var meanColumn = Array.IndexOf(headers, columns[c] + "-mean");
            var sdColumn = Array.IndexOf(headers, columns[c] + "-sd");
            Assert.True(sdColumn >= 0, $"case {number:D5}: no column {columns[c]}-sd in the results table");
            for (var k = 0; k < times.Length; k++)
            {
                means[k, c] = table[k, meanColumn];
                sds[k, c] = table[k, sdColumn];
            }
        }
        return new Expected(number, times, columns, means, sds, Range(settings, "meanRange"), Range(settings, "sdRange"));
    }

    private static (double Low, double High) Range(string[] settings, string key)
    {
        var line = settings.Single(l => l.StartsWith(key + ":", StringComparison.Ordinal));
        var parts = line[(key.Length + 1)..].Trim().Trim('(', ')').Split(',');
        return (double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture));
    }

    private static (double[,] Values, string[] Columns, double[] Times) ReadTable(string path)
    {
        var lines = File.ReadAllLines(path).Where(l => l.Trim().Length > 0).ToArray();
        var header = lines[0].Split(',').Select(h => h.Trim().Trim('"')).ToArray();
        var columns = header[1..];
        var values = new double[lines.Length - 1, columns.Length];
        var times = new double[lines.Length - 1];
        for (var r = 1; r < lines.Length; r++)
        {
            var cells = lines[r].Split(',').Select(c => double.Parse(c.Trim().Trim('"'), CultureInfo.InvariantCulture)).ToArray();
            times[r - 1] = cells[0];
            for (var c = 0; c < columns.Length; c++) values[r - 1, c] = cells[c + 1];
        }
        return (values, columns, times);
    }

    /// <summary>One case's reference: per time (rows) and variable (columns) the exact mean μ and SD σ.</summary>
    public sealed record Expected(int Number, double[] Times, string[] Columns, double[,] Mean, double[,] Sd, (double Low, double High) MeanRange, (double Low, double High) SdRange)
    {
        /// <summary>The variables the suite reports that our encoding has no quantity for: each must be constant 0 in the suite.</summary>
        public IEnumerable<string> ConstantColumns(IEnumerable<string> ours) => Columns.Except(ours);
    }
}
