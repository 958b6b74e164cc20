using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Every command refuses bad arguments with exit code 2 and a message that says what is wrong (README,
/// exit codes), never a stack trace. Each row: the arguments, with MODEL, DIR and so on standing for
/// files made in a scratch folder, and words the message must contain.
/// </summary>
public class BadArgumentTests
{
    /// <summary>One species' immigration and death: the smallest model a command accepts.</summary>
    private const string Tiny = "species\n  X = 0\nreactions\n  make: 0 -> X mass 2\n  lose: X -> 0 mass 1\n";

    public static TheoryData<string, string[]> Cases => new()
    {
        // simulate: times and grid
        { "simulate MODEL --until 0 --every 0.5 --replicates 10", ["--until must be a positive"] },
        { "simulate MODEL --until -5 --every 0.5 --replicates 10", ["--until must be a positive"] },
        { "simulate MODEL --until nan --every 0.5 --replicates 10", ["--until must be a positive"] },
        { "simulate MODEL --until 5 --every 0 --replicates 10", ["--every must be a positive"] },
        { "simulate MODEL --until 5 --every -1 --replicates 10", ["--every must be a positive"] },
        { "simulate MODEL --until 5 --every 10 --replicates 10", ["--every", "larger than --until"] },
        { "simulate MODEL --until 1e9 --every 1e-3 --replicates 10", ["grid would have", "larger --every"] },
        { "simulate MODEL --until five --every 1 --replicates 10", ["five", "expected a number"] },
        { "simulate MODEL --every 1 --replicates 10", ["--until"] },
        // replicates, method, epsilon, seed
        { "simulate MODEL --until 5 --every 1 --replicates 0", ["--replicates must be at least 1"] },
        { "simulate MODEL --until 5 --every 1 --replicates -3", ["--replicates must be at least 1"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --method gillespie", ["gillespie"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --epsilon 0", ["--epsilon must lie in (0, 1)"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --epsilon 1", ["--epsilon must lie in (0, 1)"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --epsilon -0.2", ["--epsilon must lie in (0, 1)"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --seed -1", ["-1", "expected a whole number"] },
        // model file
        { "simulate MISSING --until 5 --every 1 --replicates 10", ["model file", "missing.cnet' not found"] },
        { "simulate JUNK --until 5 --every 1 --replicates 10", ["junk.cnet:1:", "error"] },
        { "simulate DIR --until 5 --every 1 --replicates 10", ["is a directory, not a model file"] },
        { "inspect DIR", ["is a directory, not a model file"] },
        { "simulate EMPTY --until 5 --every 1 --replicates 10", ["no model file given"] },
        { "solve EMPTY --until 5 --every 1", ["no model file given"] },
        { "inspect JUNK", ["junk.cnet:1:", "error"] },
        { "inspect MISSING", ["model file", "missing.cnet' not found"] },
        // memory
        { "simulate WIDE --until 4000000 --every 1 --replicates 10", ["too fine", "larger --every"] },
        { "simulate MODEL --until 9000000 --every 1 --replicates 100000 --threads 1024", ["GB of memory", "fewer --threads"] },
        // paths, threads, shard, limits
        { "simulate MODEL --until 5 --every 1 --replicates 10 --paths -4", ["--paths takes a positive number"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --paths some", ["--paths takes a positive number", "'all'"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --threads 0", ["--threads must be between 1 and"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --threads 100000", ["--threads must be between 1 and"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --threads many", ["many", "expected a whole number"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --shard 0/3", ["--shard", "does not exist"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --shard 4/3", ["--shard", "does not exist"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --shard 1/0", ["--shard", "does not exist"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --shard half", ["--shard", "i/n"] },
        { "simulate MODEL --until 5 --every 1 --replicates 200 --shard 2/5", ["--shard 2/5", "at most 4 shards"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --max-wall 0", ["--max-wall must be a positive"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --max-wall -3", ["--max-wall must be a positive"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --max-events 0", ["--max-events must be at least 1"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --resume NOWHERE", ["does not exist"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --resume DIR", ["manifest.json", "not a CopyNumber run folder"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --frobnicate", ["--frobnicate"] },
        // the grid count in the message is the grid's own: 10 / 1e-6 is 10 000 000 steps, so 10 000 001 points
        // (0 and T included, docs/conventions.md)
        { "simulate MODEL --until 10 --every 1e-6 --replicates 10", ["10,000,001 points", "at most 10,000,000"] },
        // figure choices the run cannot honour are refused before it starts, not silently replaced
        { "simulate MODEL --until 5 --every 1 --replicates 10 --heatmap nosuch", ["--heatmap 'nosuch'", "'X'"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --at 1e9", ["--at 1000000000", "final time 5"] },
        { "simulate MODEL --until 5 --every 1 --replicates 10 --at 2,6", ["--at 6", "final time 5"] },
        // an output folder under a file
        { "simulate MODEL --until 5 --every 1 --replicates 10 --out FILE/sub", ["is a file, not a folder"] },
        // solve
        { "solve MODEL --until 0 --every 1", ["--until must be a positive"] },
        { "solve MODEL --until 5 --every 1 --rtol 2", ["--rtol must lie in (0, 1)"] },
        { "solve MODEL --until 5 --every 1 --atol -1", ["--atol must be positive"] },
        { "solve MODEL --until 5 --every 1 --solver magic", ["magic"] },
        // merge and the command itself
        { "merge --out OUT", ["argument missing", "merge"] },
        { "merge DIR", ["--out"] },
        { "merge NOWHERE --out OUT", ["does not exist"] },
        { "merge DIR --out OUT", ["manifest.json"] },
        { "", ["command"] },
        { "resimulate MODEL", ["resimulate"] },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Bad_arguments_are_refused_with_exit_code_2_and_a_clear_message(string line, string[] words)
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch, Tiny, "tiny.cnet");
        var junk = scratch.File("junk.cnet");
        File.WriteAllText(junk, "\u0001\u0002 this is not a network {}\n");
        // Ten species: a block of 64 replicates over four million grid points would not fit in one array.
        var wide = WriteModel(scratch, "species\n" + string.Concat(Enumerable.Range(0, 10).Select(i => $"  S{i} = 0\n")) + "reactions\n  make: 0 -> S0 mass 1\n", "wide.cnet");
        var folder = scratch.File("empty-folder");
        Directory.CreateDirectory(folder);
        var args = line.Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(token => token switch
        {
            "MODEL" => model,
            "JUNK" => junk,
            "WIDE" => wide,
            "MISSING" => scratch.File("missing.cnet"),
            "DIR" => folder,
            "NOWHERE" => scratch.File("nowhere"),
            "OUT" => scratch.File("out"),
            "EMPTY" => "",
            "FILE/sub" => Path.Combine(model, "sub"),
            _ => token,
        }).ToArray();

        var run = CliRun.Of(args);
        Assert.True(run.ExitCode == 2, $"exit code {run.ExitCode} for '{line}': {run.Error}");
        foreach (var word in words) Assert.Contains(word, run.Error);
        AssertNoStackTrace(run);
        Assert.DoesNotContain("System.", run.Error); // no .NET type names
        Assert.DoesNotContain("(Parameter '", run.Error); // nor .NET argument names
        Assert.DoesNotContain("part of the path", run.Error);
        Assert.False(Directory.Exists(scratch.File("out")));
    }
}
