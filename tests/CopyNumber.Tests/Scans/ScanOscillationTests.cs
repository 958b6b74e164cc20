using System.Globalization;
using CopyNumber.Runs.Scans;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Scans;

/// <summary>
/// A scan across a Hopf bifurcation: the rate equations' limit cycle is named in scan.parquet, never counted as a steady
/// state, and a cycling point is not drawn or flagged as "adequate". The Brusselator (Prigogine &amp; Lefever 1968,
/// J. Chem. Phys. 48:1695) with A = 1: steady state X = A, Y = B/A, a stable focus for B &lt; 1 + A² = 2 and a limit
/// cycle beyond it, ringing at frequency ≈ A near the bifurcation (so its period is near 2π). Every point starts at
/// X = Ω, Y = 2Ω, off the steady state at B = 3 (a start on the unstable steady state would stay there).
/// </summary>
public sealed class ScanOscillationTests
{
    private static string Brusselator(double size) => string.Create(CultureInfo.InvariantCulture, $"""
        # illustrative Brusselator at system size {size}
        size {size}
        species
          X = {size}
          Y = {2 * size}
        parameters
          A = 1
          B = 3
        reactions
          make:    0 -> X          mass A
          convert: X -> Y          mass B
          autocat: 2 X + Y -> 3 X  mass 1
          decay:   X -> 0          mass 1
        """);

    [Fact]
    public void A_point_past_the_Hopf_bifurcation_is_a_limit_cycle_and_not_a_steady_state()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("brusselator.cnet");
        File.WriteAllText(model, Brusselator(200));
        var folder = scratch.File("scan");
        var run = CliRun.Of("scan", model, "--vary", "B=1.5,3", "--until", "60", "--every", "1", "--replicates", "200",
            "--seed", "3", "--method", "direct", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);
        var table = ParquetReadBack.Of(Path.Combine(folder, ScanRunner.TableFile));
        T[] Column<T>(string name) => (T[])table.Values[Array.IndexOf(table.Names, name)];
        var b = Column<double>("vary_B");
        var behaviour = Column<string>("rate_equations_behaviour");
        var period = Column<double>("rate_equations_period");
        var stable = Column<long>("stable_steady_states");
        var adequate = Column<long>("adequate");
        var cycles = Column<long>("cycles_with_rate_equations");
        for (var i = 0; i < b.Length; i++)
        {
            if (b[i] == 1.5)
            {
                // Below Hopf: the focus rings at 2π/|Im λ|, λ² − (B − 1 − A²)λ + A² = 0, so |Im λ| = √(1 − 0.0625) at B = 1.5.
                Assert.Equal("damped oscillation", behaviour[i]);
                Assert.Equal(2 * Math.PI / Math.Sqrt(1 - 0.0625), period[i], 1e-6);
                Assert.Equal(1, stable[i]);
            }
            else
            {
                Assert.Equal("limit cycle", behaviour[i]);
                Assert.Equal(0, stable[i]);
                Assert.True(period[i] > 2 * Math.PI, $"period {period[i]}: the relaxation cycle at B = 3 is slower than 2π/A");
                Assert.Equal(0, adequate[i]);
                Assert.Equal(1, cycles[i]);
            }
        }
    }
}
