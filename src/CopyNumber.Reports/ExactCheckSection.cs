using System.Text.Json;
using CopyNumber.Storage;
using static CopyNumber.Reports.ValidationSection;

namespace CopyNumber.Reports;

/// <summary>
/// The report's account of the ensemble's check against the exact law of the master equation (manifest.json
/// <c>exact_check</c>, written by <c>simulate --check-exact</c> or its automatic rule): per count quantity the
/// largest Kolmogorov distance, its time and the distance allowed there, and the family-wise level.
/// </summary>
internal static class ExactCheckSection
{
    /// <summary>The section, or null when the run was not checked.</summary>
    public static ReportSection? For(RunManifest manifest)
    {
        if (!manifest.Extra.TryGetValue(ManifestFields.ExactCheck, out var value) || value is not JsonElement { ValueKind: JsonValueKind.Object } check)
            return null;
        if (check.TryGetProperty("skipped", out var skipped))
            return new ReportSection("Ensemble against the exact law", [$"Not checked: {skipped.GetString()}"], [], []);
        var agrees = check.TryGetProperty("agrees", out var a) && a.ValueKind == JsonValueKind.True;
        var rows = new List<IReadOnlyList<string>>();
        if (check.TryGetProperty("quantities", out var quantities) && quantities.ValueKind == JsonValueKind.Array)
            foreach (var q in quantities.EnumerateArray())
                rows.Add([Text(q, "quantity"), Number(q, "largest_kolmogorov_distance"), Number(q, "time"), Number(q, "allowed"), Number(q, "replicates"),
                    q.TryGetProperty("agrees", out var qa) && qa.ValueKind == JsonValueKind.True ? "agrees" : "disagrees"]);
        return new ReportSection(
            "Ensemble against the exact law",
            [$"The master equation was solved on the run's grid ({Number(check, "states")} states, projection bound at most {Number(check, "largest_projection_bound")}); "
                + (agrees ? "the ensemble agrees with the exact law" : "the ensemble disagrees with the exact law")
                + $" at family-wise level {Number(check, "family_wise_level")} over {Number(check, "tests")} tests (grid times × count quantities, Bonferroni; Kolmogorov distance with Stephens' critical value, docs/methods.md)."],
            [new ReportTable(["quantity", "largest Kolmogorov distance", "at time", "allowed there", "replicates", "result"], rows)],
            []);
    }
}
