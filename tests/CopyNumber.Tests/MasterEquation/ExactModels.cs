using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>Small models for the master-equation checks, written with species, reactions and mass laws only.</summary>
internal static class ExactModels
{
    public static ReactionNetwork Load(string text, string name = "exact-test.cnet")
    {
        var loaded = ModelLoader.LoadText(text, name);
        Assert.True(loaded.Model is not null, string.Join("\n", loaded.Diagnostics.Select(d => d.Format())));
        return loaded.Model!.Network;
    }

    public static ReactionNetwork ImmigrationDeath(double k, double mu) =>
        Load($"species\n  X = 0\nreactions\n  birth: 0 -> X mass {F(k)}\n  death: X -> 0 mass {F(mu)}\n");

    public static ReactionNetwork Isomerisation(long n, double c1, double c2) =>
        Load($"species\n  A = {n}\n  B = 0\nreactions\n  forward: A -> B mass {F(c1)}\n  back: B -> A mass {F(c2)}\n");

    public static ReactionNetwork Telegraph(double kOn, double kOff, double kTx, double decay) =>
        Load($"species\n  off = 1\n  on = 0\n  m = 0\nreactions\n  activate: off -> on mass {F(kOn)}\n  deactivate: on -> off mass {F(kOff)}\n"
            + $"  transcribe: on -> on + m mass {F(kTx)}\n  degrade: m -> 0 mass {F(decay)}\n");

    public static string F(double value) => value.ToString("R", CultureInfo.InvariantCulture);

    /// <summary>ln Γ by Lanczos' approximation (g = 7, 9 terms; Press et al. 2007, Numerical Recipes 3rd ed., §6.1), relative error ≈ 1e-15.</summary>
    public static double LogGamma(double x)
    {
        double[] c = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
            12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7];
        if (x < 0.5) return Math.Log(Math.PI / Math.Abs(Math.Sin(Math.PI * x))) - LogGamma(1 - x);
        x -= 1;
        var a = c[0];
        var t = x + 7.5;
        for (var i = 1; i < 9; i++) a += c[i] / (x + i);
        return 0.5 * Math.Log(2 * Math.PI) + (x + 0.5) * Math.Log(t) - t + Math.Log(a);
    }

    /// <summary>Poisson(mean) probability of n, through logarithms.</summary>
    public static double Poisson(double mean, long n) =>
        mean == 0 ? (n == 0 ? 1 : 0) : Math.Exp(n * Math.Log(mean) - mean - LogGamma(n + 1));

    /// <summary>Binomial(n, q) probability of k, through logarithms.</summary>
    public static double Binomial(long n, double q, long k) =>
        q == 0 ? (k == 0 ? 1 : 0) : q == 1 ? (k == n ? 1 : 0)
        : Math.Exp(LogGamma(n + 1) - LogGamma(k + 1) - LogGamma(n - k + 1) + k * Math.Log(q) + (n - k) * Math.Log(1 - q));
}
