using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// Options that take a count (replicates, events, states): written like any other number on the command line,
/// so <c>--replicates 1e3</c> is accepted as <c>--until 1e3</c> is, as long as the value is a whole number.
/// </summary>
internal static class CountOption
{
    /// <summary>An option named <paramref name="name"/> whose value is a whole number, in plain or scientific notation.</summary>
    public static Option<long?> Create(string name, string description) =>
        new(name) { Description = description, CustomParser = result => Parse(name, result) };

    private static long? Parse(string name, ArgumentResult result)
    {
        var text = result.Tokens.Count == 0 ? "" : result.Tokens[^1].Value;
        // Plain integers first: every long is exact that way, while a double holds integers exactly only up to 2^53.
        if (long.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var whole)) return whole;
        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value)
            && double.IsFinite(value) && value == Math.Floor(value) && Math.Abs(value) <= 1L << 53)
            return (long)value;
        result.AddError($"{name} takes a whole number, e.g. 2000 or 2e3 (got '{text}')");
        return null;
    }
}
