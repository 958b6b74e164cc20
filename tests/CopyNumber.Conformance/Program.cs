using System.Diagnostics;
using CopyNumber.Conformance;
using CopyNumber.Stochastic;

// dotnet run --project tests/CopyNumber.Conformance -c Release -- PATH [--semantic FROM-TO] [--stochastic FROM-TO] [--replicates N] [--methods direct,next-reaction,composition-rejection]
// PATH is the folder of SBML Test Suite cases (with semantic/ and stochastic/). Exit 0 when no case fails, 1 otherwise, 2 for bad arguments.
if (args.Length == 0 || !Directory.Exists(args[0]))
{
    Console.Error.WriteLine("usage: CopyNumber.Conformance PATH [--semantic FROM-TO|none] [--stochastic FROM-TO|none] [--replicates N] [--methods LIST]");
    return 2;
}
var root = args[0];
string? Option(string name) => Array.IndexOf(args, name) is var i and >= 0 && i + 1 < args.Length ? args[i + 1] : null;
(int, int)? Range(string? text) => text switch
{
    null => (1, int.MaxValue),
    "none" => null,
    _ => text.Split('-') is [var a, var b] ? (int.Parse(a), int.Parse(b)) : (int.Parse(text), int.Parse(text)),
};
var methods = (Option("--methods") ?? "direct,next-reaction,composition-rejection").Split(',').Select(m => m switch
{
    "direct" => SimulationMethod.Direct,
    "next-reaction" => SimulationMethod.NextReaction,
    "composition-rejection" => SimulationMethod.CompositionRejection,
    _ => throw new ArgumentException($"unknown exact method '{m}'"),
}).ToList();
var runner = new CaseRunner(new RunnerOptions(long.Parse(Option("--replicates") ?? "10000"), 20260612, methods, Environment.ProcessorCount));

var outcomes = new List<CaseOutcome>();
var clock = Stopwatch.StartNew();
foreach (var (kind, range) in new[] { ("semantic", Range(Option("--semantic"))), ("stochastic", Range(Option("--stochastic"))) })
{
    if (range is not (var from, var to) || !Directory.Exists(Path.Combine(root, kind))) continue;
    foreach (var folder in Directory.GetDirectories(Path.Combine(root, kind)).Order())
    {
        if (!int.TryParse(Path.GetFileName(folder), out var number) || number < from || number > to) continue;
        CaseOutcome outcome;
        try { outcome = runner.Run(folder, kind); }
        catch (Exception e) when (e is IOException or FormatException or KeyNotFoundException or IndexOutOfRangeException or InvalidOperationException)
        {
            outcome = new CaseOutcome(Path.GetFileName(folder), kind, CaseOutcome.Failed, $"runner error: {e.GetType().Name}: {e.Message}", []);
        }
        outcomes.Add(outcome);
        Console.WriteLine(outcome);
    }
}

Console.WriteLine();
foreach (var kind in outcomes.Select(o => o.Kind).Distinct())
{
    var of = outcomes.Where(o => o.Kind == kind).ToList();
    Console.WriteLine($"{kind}: {of.Count(o => o.Verdict == CaseOutcome.Passed)} passed, {of.Count(o => o.Verdict == CaseOutcome.Failed)} failed, {of.Count(o => o.Verdict == CaseOutcome.Unsupported)} unsupported of {of.Count}");
    Console.WriteLine($"  {"tag",-32} {"passed",7} {"failed",7} {"unsupported",12}");
    foreach (var tag in of.SelectMany(o => o.Tags).Distinct().Order())
    {
        var tagged = of.Where(o => o.Tags.Contains(tag)).ToList();
        Console.WriteLine($"  {tag,-32} {tagged.Count(o => o.Verdict == CaseOutcome.Passed),7} {tagged.Count(o => o.Verdict == CaseOutcome.Failed),7} {tagged.Count(o => o.Verdict == CaseOutcome.Unsupported),12}");
    }
}
Console.WriteLine($"{outcomes.Count} cases in {clock.Elapsed.TotalSeconds:0} s");
return outcomes.Any(o => o.Verdict == CaseOutcome.Failed) ? 1 : 0;
