using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Random command lines drawn from the real commands, options and values mixed with junk (fixed seed):
/// whatever the combination, the command must end with a documented exit code (0, 1 or 2; nothing
/// interrupts these runs) and never let an exception's stack trace reach the user. Grids, replicate
/// counts and limits in the vocabulary are tiny, so even the valid combinations run in milliseconds.
/// </summary>
public class ArgumentFuzzTests
{
    private const string Tiny = "species\n  X = 0\nreactions\n  make: 0 -> X mass 2\n  lose: X -> 0 mass 1\nreadouts\n  half = X / 2\n";

    [Fact]
    public void Random_argument_lists_end_with_a_documented_exit_code_and_no_stack_trace()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch, Tiny, "tiny.cnet");
        var junkModel = scratch.File("junk.cnet");
        File.WriteAllText(junkModel, "reactions\n  make: -> -> X mass\n");
        var existingRun = scratch.File("existing-run");
        Assert.Equal(0, CliRun.Of("simulate", model, "--until", "1", "--every", "0.5", "--replicates", "130", "--seed", "1", "--shard", "1/2", "--out", existingRun).ExitCode);
        var blocker = scratch.File("a-file");
        File.WriteAllText(blocker, "");

        var commands = new[] { "simulate", "solve", "inspect", "merge", "simulate", "simulate", "bogus", "" };
        var vocabulary = new Dictionary<string, string[]>
        {
            ["--until"] = ["1", "0.5", "0", "-1", "nan", "inf", "1e308", "abc", ""],
            ["--every"] = ["0.5", "0.25", "1", "0", "-0.1", "2", "1e-300", "x"],
            ["--replicates"] = ["10", "1", "0", "-1", "70", "abc", "99999999999999999999"],
            ["--threads"] = ["1", "2", "0", "-1", "x", "1000000"],
            ["--method"] = ["direct", "next-reaction", "tau-leap", "bogus", ""],
            ["--epsilon"] = ["0.03", "0", "1", "2", "-1", "nan"],
            ["--seed"] = ["1", "2", "-1", "x", "18446744073709551615", "18446744073709551616"],
            ["--paths"] = ["1", "all", "0", "-1", "x", "5"],
            ["--shard"] = ["1/2", "2/2", "0/1", "3/2", "1/1", "x", "1/", "/2", "2/1000000"],
            ["--max-wall"] = ["5", "0", "-1", "x", "1e300"],
            ["--max-events"] = ["10", "0", "-5", "1"],
            ["--out"] = ["NEW", "NEW", existingRun, blocker, Path.Combine(blocker, "sub"), ""],
            ["--resume"] = [existingRun, scratch.File("nowhere"), blocker],
            ["--force"] = [],
            ["--json"] = [],
            ["--solver"] = ["auto", "explicit", "stiff", "magic"],
            ["--rtol"] = ["1e-6", "0", "2", "x"],
            ["--atol"] = ["1e-9", "0", "-1"],
            ["--help"] = [],
        };
        var models = new[] { model, model, model, junkModel, scratch.File("missing.cnet"), scratch.Path, existingRun };
        var junk = new[] { "--", "-", "", " ", "--until=1", "é", "-x", "--replicates", "\t", "@file", "--version" };
        var options = vocabulary.Keys.ToArray();
        var random = new Random(20240611);
        var codes = new Dictionary<int, int>();

        // Valid lines to start from, so that mutations also reach the checks behind the parser.
        string[][] templates =
        [
            ["simulate", model, "--until", "1", "--every", "0.5", "--replicates", "10", "--seed", "3", "--out", "NEW"],
            ["simulate", model, "--until", "1", "--every", "0.5", "--replicates", "130", "--seed", "1", "--shard", "2/2", "--out", "NEW"],
            ["simulate", model, "--until", "1", "--every", "0.5", "--replicates", "130", "--resume", existingRun],
            ["solve", model, "--until", "1", "--every", "0.5"],
            ["inspect", model, "--json"],
            ["merge", existingRun, "--out", "NEW"],
        ];
        string Fresh(string value, int trial, int i) => value == "NEW" ? scratch.File($"out-{trial}-{i}") : value;

        for (var trial = 0; trial < 300; trial++)
        {
            var args = new List<string>();
            if (random.Next(2) == 0)
            {
                args.AddRange(templates[random.Next(templates.Length)]);
                var mutations = random.Next(1, 4);
                for (var m = 0; m < mutations && args.Count > 0; m++)
                {
                    var at = random.Next(args.Count);
                    switch (random.Next(4))
                    {
                        case 0:
                            args.RemoveAt(at);
                            break;
                        case 1:
                            args[at] = junk[random.Next(junk.Length)];
                            break;
                        default:
                            // Replace an option's value, or insert another option with one of its values.
                            var option = at > 0 && vocabulary.ContainsKey(args[at - 1]) ? args[at - 1] : options[random.Next(options.Length)];
                            var values = vocabulary[option];
                            var value = values.Length > 0 ? values[random.Next(values.Length)] : option;
                            if (at > 0 && args[at - 1] == option) args[at] = value;
                            else args.InsertRange(at, values.Length > 0 ? [option, value] : [option]);
                            break;
                    }
                }
            }
            else
            {
                var command = commands[random.Next(commands.Length)];
                if (command.Length > 0) args.Add(command);
                var positional = random.Next(3);
                for (var p = 0; p < positional; p++) args.Add(models[random.Next(models.Length)]);
                var count = random.Next(9);
                for (var i = 0; i < count; i++)
                {
                    if (random.Next(8) == 0)
                    {
                        args.Add(junk[random.Next(junk.Length)]);
                        continue;
                    }
                    var option = options[random.Next(options.Length)];
                    args.Add(option);
                    var values = vocabulary[option];
                    if (values.Length > 0 && random.Next(10) > 0) args.Add(values[random.Next(values.Length)]);
                }
            }
            for (var i = 0; i < args.Count; i++) args[i] = Fresh(args[i], trial, i);

            var run = CliRun.Of([.. args]);
            var line = string.Join(" ", args);
            Assert.True(run.ExitCode is 0 or 1 or 2, $"exit code {run.ExitCode} for: {line}\n{run.Error}");
            Assert.False(run.Error.Contains("   at ") || run.Output.Contains("   at "), $"stack trace for: {line}\n{run.Error}");
            Assert.DoesNotContain("Unhandled", run.Error);
            if (run.ExitCode != 0) Assert.False(string.IsNullOrWhiteSpace(run.Error), $"exit {run.ExitCode} without a message for: {line}");
            codes[run.ExitCode] = codes.GetValueOrDefault(run.ExitCode) + 1;
        }
        // The vocabulary reaches both outcomes: some lines run, most are refused.
        Assert.True(codes.GetValueOrDefault(0) > 0 && codes.GetValueOrDefault(2) > 0, string.Join(", ", codes.Select(c => $"{c.Key}: {c.Value}")));
    }
}
