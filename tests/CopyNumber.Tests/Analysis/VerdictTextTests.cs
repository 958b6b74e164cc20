using CopyNumber.Analysis.Verdicts;

namespace CopyNumber.Tests.Analysis;

/// <summary>How verdict sentences write numbers (common practice: significant digits no finer than the resolution).</summary>
public sealed class VerdictTextTests
{
    [Theory]
    [InlineData(-7.4e-8, 0, "0%")]
    [InlineData(0.14, 0, "14%")]
    [InlineData(0.025, 0, "2.5%")]
    [InlineData(0.0042, 0, "0.42%")]
    [InlineData(0.003, 0.01, "0%")]
    [InlineData(-0.031, 0.01, "−3.1%")]
    public void Percentages(double fraction, double resolution, string expected) => Assert.Equal(expected, VerdictText.Percent(fraction, resolution));

    [Theory]
    [InlineData(0.70710678, 0, "0.707")]
    [InlineData(12345.6, 0, "12346")]
    [InlineData(-0.5, 0, "−0.5")]
    [InlineData(0.000123, 0, "0.000123")]
    [InlineData(-1e-20, 1e-9, "0")]
    [InlineData(0.0004, 0.001, "0")]
    public void Numbers(double x, double resolution, string expected) => Assert.Equal(expected, VerdictText.Number(x, resolution));

    [Fact]
    public void Signs_are_dropped_from_what_prints_as_zero()
    {
        Assert.Equal("+14%", VerdictText.SignedPercent(0.14));
        Assert.Equal("−3%", VerdictText.SignedPercent(-0.03));
        Assert.Equal("0%", VerdictText.SignedPercent(-1e-9));
        Assert.Equal("0", VerdictText.SignedNumber(-1e-12, 1e-6));
    }
}
