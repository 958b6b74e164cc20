using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

public class BistableContrastTests
{
    // A one-species chain of Schlögl type (Schlögl 1972, Z. Physik 253:147): 0 ⇌ X and 2X ⇌ 3X. With our
    // mass-action convention the rate equation is dx/dt = k3 + k1·x² − k2·x³ − k4·x; the constants are
    // chosen (illustrative, worked out in this comment) so that it factorises as −k2·(x − 100)(x − 250)(x − 400):
    // k2 = 1e-5, k1 = 750·k2 = 0.0075, k4 = 165000·k2 = 1.65, k3 = 1e7·k2 = 100. The fixed point x = 250 is
    // unstable (J = +0.225), 100 and 400 are stable.
    private const string Schloegl =
        "# illustrative Schlögl-type bistable chain\nspecies\n  X = 250\nparameters\n  k1 = 0.0075\n  k2 = 1e-5\n  k3 = 100\n  k4 = 1.65\n" +
        "reactions\n  inflow: 0 -> X mass k3\n  outflow: X -> 0 mass k4\n  autocatalysis: 2 X -> 3 X mass k1\n  crowding: 3 X -> 2 X mass k2\n";

    [Fact]
    public void Started_at_the_unstable_point_the_rate_equations_stay_there_while_the_ensemble_splits_into_two_modes()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("schloegl.cnet");
        File.WriteAllText(model, Schloegl);
        var folder = scratch.File("run");
        var run = CliRun.Of("simulate", model, "--until", "20", "--every", "1", "--replicates", "400", "--seed", "17", "--method", "direct", "--out", folder);
        Assert.Equal(0, run.ExitCode);

        var moments = ParquetReadBack.Of(Path.Combine(folder, "moments.parquet"));
        var deterministic = (double[])moments.Values[16];
        Assert.All(deterministic, value => Assert.Equal(250, value, 1e-3));

        // Two modes at the final time, one near each stable point, and the verdict says so.
        var verdicts = run.Output.Split('\n').Where(l => l.StartsWith("X ", StringComparison.Ordinal)).ToArray();
        var multimodal = Assert.Single(verdicts, l => l.Contains("multimodal"));
        Assert.Contains("2 modes at the final time", multimodal);
        var distributions = ParquetReadBack.Of(Path.Combine(folder, "distributions.parquet"));
        var time = (double[])distributions.Values[0];
        var count = (long[])distributions.Values[2];
        var probability = (double[])distributions.Values[Array.IndexOf(distributions.Names, "probability")];
        double low = 0, high = 0;
        for (var row = 0; row < time.Length; row++)
        {
            if (time[row] != 20) continue;
            if (count[row] < 175) low += probability[row];
            if (count[row] > 325) high += probability[row];
        }
        Assert.True(low > 0.2 && high > 0.2, $"P(X < 175) = {low}, P(X > 325) = {high}");
    }
}
