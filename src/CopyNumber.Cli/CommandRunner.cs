using System.CommandLine;
using System.Text.RegularExpressions;
using CopyNumber.Analysis;
using CopyNumber.Language;
using CopyNumber.Output;

namespace CopyNumber.Cli;

/// <summary>
/// The one place that turns failures into messages and exit codes: parse errors, bad arguments, a refused
/// output folder and a run folder that cannot be resumed or merged give 2, a failed run gives 1, and no
/// stack trace ever reaches the user.
/// </summary>
internal static partial class CommandRunner
{
    public static int Run(RootCommand root, string[] args, TextWriter? output = null, TextWriter? error = null)
    {
        output ??= Console.Out;
        error ??= Console.Error;
        ParseResult parsed;
        try
        {
            parsed = root.Parse(args);
        }
        catch (Exception e)
        {
            error.WriteLine($"error: cannot read the arguments: {e.Message}");
            return ExitCodes.BadInput;
        }
        if (parsed.Errors.Count > 0)
        {
            foreach (var problem in parsed.Errors) error.WriteLine($"error: {InWords(problem.Message)}");
            error.WriteLine("Run with --help to see the commands and their options.");
            return ExitCodes.BadInput;
        }
        try
        {
            return parsed.Invoke(new InvocationConfiguration { Output = output, Error = error, EnableDefaultExceptionHandler = false, ProcessTerminationTimeout = null });
        }
        catch (ModelInputException e)
        {
            foreach (var d in e.Diagnostics) error.WriteLine(d.Format());
            error.WriteLine(e.Diagnostics.Count == 1 ? "1 error" : $"{e.Diagnostics.Count} errors");
            return ExitCodes.BadInput;
        }
        catch (Exception e) when (Unsupported(e) is { } unsupported)
        {
            // A valid model that the chosen method cannot carry out yet (a state-triggered change, a
            // non-integer amount in a stochastic run): bad input, with the model's line.
            foreach (var d in unsupported.Problems) error.WriteLine(d.Format());
            return ExitCodes.BadInput;
        }
        catch (UserInputException e)
        {
            error.WriteLine($"error: {e.Message}");
            return ExitCodes.BadInput;
        }
        catch (RunFolderException e)
        {
            error.WriteLine($"error: {e.Message}");
            return ExitCodes.BadInput;
        }
        catch (AnalysisInputException e)
        {
            error.WriteLine($"error: {e.Message}");
            return ExitCodes.BadInput;
        }
        catch (OutputException e) when (e.IsRefusal)
        {
            error.WriteLine($"error: {e.Message}");
            return ExitCodes.BadInput;
        }
        catch (OperationCanceledException)
        {
            error.WriteLine("interrupted");
            return ExitCodes.Interrupted;
        }
        catch (Exception e)
        {
            error.WriteLine($"error: {Describe(e)}");
            return ExitCodes.RunFailed;
        }
    }

    /// <summary>The parser names .NET types ("expected type 'System.Int32'"); say what is expected instead.</summary>
    private static string InWords(string message) =>
        ExpectedType().Replace(message, m => m.Groups[1].Value switch
        {
            var t when t.Contains("UInt64") => "; expected a whole number from 0 to 18446744073709551615",
            var t when t.Contains("Int32") || t.Contains("Int64") => "; expected a whole number",
            var t when t.Contains("Double") => "; expected a number such as 0.5 or 1e3",
            _ => "",
        });

    [GeneratedRegex(@" as expected type '([^']+)'")]
    private static partial Regex ExpectedType();

    private static Network.UnsupportedModelException? Unsupported(Exception e) => e switch
    {
        Network.UnsupportedModelException u => u,
        AggregateException { InnerExceptions.Count: > 0 } a => a.InnerExceptions.Select(Unsupported).FirstOrDefault(u => u is not null),
        { InnerException: { } inner } => Unsupported(inner),
        _ => null,
    };

    private static string Describe(Exception e) =>
        e is AggregateException { InnerExceptions.Count: 1 } a ? Describe(a.InnerExceptions[0]) : e.Message;
}

/// <summary>Carries a model's diagnostics to the one place that prints them.</summary>
internal sealed class ModelInputException(IReadOnlyList<Diagnostic> diagnostics) : Exception("the model has errors")
{
    public IReadOnlyList<Diagnostic> Diagnostics { get; } = diagnostics;
}
