using System.CommandLine;
using System.Text.RegularExpressions;
using CopyNumber.Language;

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
        catch (Exception e) when (Unwrapped(e) is CopyNumberException known)
        {
            foreach (var line in known.Lines) error.WriteLine(known.LinesArePrefixed ? line : $"error: {line}");
            return ExitCodes.For(known.Kind);
        }
        catch (OperationCanceledException)
        {
            error.WriteLine("interrupted");
            return ExitCodes.Interrupted;
        }
        catch (Exception e)
        {
            // Not one of ours: a defect of the program or of its platform. Still no stack trace.
            error.WriteLine($"error: {Unwrapped(e).Message}");
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

    private static Exception Unwrapped(Exception e) =>
        e is AggregateException { InnerExceptions.Count: 1 } a ? Unwrapped(a.InnerExceptions[0]) : e;
}
