namespace CopyNumber.Conformance;

/// <summary>What became of one case: passed, failed with its worst deviation, or unsupported with the importer's (or engine's) reason.</summary>
internal sealed record CaseOutcome(string Case, string Kind, string Verdict, string Detail, IReadOnlyList<string> Tags)
{
    public const string Passed = "passed", Failed = "failed", Unsupported = "unsupported";

    public override string ToString() => $"{Case} {Kind,-10} {Verdict,-11} {Detail}";
}
