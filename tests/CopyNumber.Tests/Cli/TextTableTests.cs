using CopyNumber.Cli.Rendering;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// The console table with a long text last column (a verdict's reason runs to several hundred characters on an
/// oscillating species): before, the rule under the header was as long as the longest reason (over 900 dashes on the
/// ring scenario). Each row stays one line so that scripts can grep it (common practice for console tables).
/// </summary>
public sealed class TextTableTests
{
    [Fact]
    public void A_long_reason_keeps_its_row_on_one_line_and_the_rule_stays_short()
    {
        var reason = string.Join(' ', Enumerable.Range(0, 80).Select(i => $"word{i}"));
        var lines = new TextTable("quantity", "verdict", "reason").Add("p1", "cycles", reason).Add("m1", "adequate", "short").ToString()
            .TrimEnd('\n').Split('\n');
        var start = lines[0].IndexOf("reason", StringComparison.Ordinal);
        Assert.Equal(4, lines.Length);
        Assert.Equal(start + TextTable.LongestRule, lines[1].Length);
        Assert.Equal(reason, lines[2][start..]);
        Assert.Equal("short", lines[3][start..]);
    }
}
