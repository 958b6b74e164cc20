using System.Text.Json;
using System.Text.Json.Nodes;
using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// The <c>validation</c> object of manifest.json and of the tables' <c>copynumber.validation</c> footer
/// entry (the same JSON): sample size and cost, family, the worst mean and standard-deviation intervals,
/// the resolution, the verdict and the action. docs/conventions.md lists its fields.
/// </summary>
public static class ValidationManifest
{
    /// <summary>The object for <paramref name="validation"/>.</summary>
    public static JsonObject Of(ValidationResult validation)
    {
        ArgumentNullException.ThrowIfNull(validation);
        return new JsonObject
        {
            ["sample_method"] = "direct",
            ["sample_replicates"] = validation.Sample.Replicates,
            ["sample_seed"] = "SplitMix64(seed xor 0x76616C6964617465); sample replicate k uses the stream of (sample seed, k)",
            ["sample_seconds"] = Finite(validation.Sample.WallTime.TotalSeconds),
            ["tau_leap_seconds"] = Finite(validation.MainWallTime.TotalSeconds),
            ["cost_percent"] = Finite(validation.CostPercent),
            ["family_confidence"] = 1 - ValidationComparison.FamilyAlpha,
            ["intervals"] = validation.Intervals,
            ["z"] = Finite(validation.Z),
            ["mean_tolerance"] = ValidationComparison.MeanTolerance,
            ["sd_tolerance"] = ValidationComparison.StandardDeviationTolerance,
            ["mean_worst"] = Cell(validation.WorstMean, c => c.Mean),
            ["sd_worst"] = Cell(validation.WorstStandardDeviation, c => c.StandardDeviation),
            ["mean_resolution"] = Finite(validation.MeanResolution),
            ["sd_resolution"] = Finite(validation.StandardDeviationResolution),
            ["verdict"] = Snake(validation.Verdict.ToString()),
            ["action"] = Snake(validation.Action.ToString()),
            ["statement"] = validation.Describe(),
        };
    }

    /// <summary>The object as compact JSON text, for a Parquet footer.</summary>
    public static string Text(ValidationResult validation) => Of(validation).ToJsonString(new JsonSerializerOptions { WriteIndented = false });

    private static JsonObject? Cell(ValidationCell? cell, Func<ValidationCell, RelativeErrorInterval?> pick)
    {
        if (cell is null || pick(cell) is not { } i) return null;
        return new JsonObject
        {
            ["time"] = cell.Time,
            ["quantity"] = cell.Quantity,
            ["estimate"] = Finite(i.Estimate),
            ["lower"] = Finite(i.Lower),
            ["upper"] = Finite(i.Upper),
        };
    }

    private static double? Finite(double value) => double.IsFinite(value) ? value : null;

    private static string Snake(string pascal) =>
        string.Concat(pascal.Select((c, i) => char.IsUpper(c) && i > 0 ? "_" + char.ToLowerInvariant(c) : char.ToLowerInvariant(c).ToString()));
}
