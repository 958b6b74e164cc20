using System.Globalization;
using System.Text.Json;
using CopyNumber.Storage;

namespace CopyNumber.Reports;

/// <summary>
/// The report's account of a tau-leaping run's validation sample (manifest.json <c>validation</c>):
/// the statement, the worst intervals, and a caution when the leaping error was detected, so that a mean
/// shifted from the rate equations is not read as the model's doing.
/// </summary>
internal static class ValidationSection
{
    /// <summary>The caution printed above the verdicts when the sample detected a leaping error.</summary>
    public const string MethodErrorCaution =
        "The exact validation sample disagrees with the tau-leaping ensemble: a deviation of the ensemble mean from the rate equations " +
        "that the exact sample does not share is the method's error, not the model's (see 'Tau-leaping error').";

    /// <summary>The section, or null when the run has no validation sample.</summary>
    public static ReportSection? For(RunManifest manifest, List<string> cautions)
    {
        if (!manifest.Extra.TryGetValue(ManifestFields.Validation, out var value) || value is not JsonElement { ValueKind: JsonValueKind.Object } validation)
            return null;
        var verdict = Text(validation, "verdict");
        var action = Text(validation, "action");
        if (action != "fell_back" && verdict is "outside_tolerance" or "within_tolerance") cautions.Add(MethodErrorCaution);
        var rows = new List<IReadOnlyList<string>>();
        foreach (var (key, label) in new[] { ("mean_worst", "mean"), ("sd_worst", "standard deviation") })
        {
            if (!validation.TryGetProperty(key, out var cell) || cell.ValueKind != JsonValueKind.Object) continue;
            rows.Add([label, Number(cell, "time"), Text(cell, "quantity"), Percent(cell, "estimate"), $"[{Percent(cell, "lower")}, {Percent(cell, "upper")}]"]);
        }
        return new ReportSection(
            "Tau-leaping error (validation sample)",
            [Text(validation, "statement")],
            rows.Count == 0 ? [] : [new ReportTable(["relative error of", "worst time", "quantity", "estimate", "simultaneous 99% interval"], rows)],
            []);
    }

    internal static string Text(JsonElement element, string name) =>
        element.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.String ? v.GetString() ?? "" : "";

    internal static string Number(JsonElement element, string name) =>
        element.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.Number ? v.GetDouble().ToString("G6", CultureInfo.InvariantCulture) : "-";

    private static string Percent(JsonElement element, string name)
    {
        if (!element.TryGetProperty(name, out var v) || v.ValueKind != JsonValueKind.Number) return "-";
        var x = v.GetDouble();
        return Math.Abs(x) < 5e-5 ? "0%" : (100 * x).ToString("+0.00;-0.00", CultureInfo.InvariantCulture) + "%";
    }
}
