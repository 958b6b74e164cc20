using CopyNumber.Network;
using CopyNumber.Runs.Scans;
using CopyNumber.Tests.Cli;

namespace CopyNumber.Tests.Scans;

public class ScanDesignTests
{
    private static LoadedModel Toggle() => ModelLoader.Load(CliRun.Scenario("toggle_pair.cnet")).Model!;

    [Fact]
    public void A_list_and_the_two_ranges_read_as_documented()
    {
        var network = Toggle().Network;
        Assert.Equal([1.0, 2, 5], ScanAxis.Parse("a=5,1,2", network).Values);
        Assert.Equal([10.0, 20, 30], ScanAxis.Parse("a=10:30:lin:3", network).Values);
        // Logarithmic: equal ratios, ends exact, interior rounded to 12 significant digits.
        Assert.Equal([0.1, 1, 10], ScanAxis.Parse("K=0.1:10:log:3", network).Values);
        Assert.Equal([5.0, 10, 20], ScanAxis.Parse("K=5:20:log:3", network).Values);
        Assert.Equal(ScanTarget.Size, ScanAxis.Parse("size=1,2", network).Target);
        Assert.Equal(ScanTarget.InitialCount, ScanAxis.Parse("U=0,5", network).Target);
    }

    [Theory]
    [InlineData("a", "NAME=SPEC")]
    [InlineData("nope=1,2", "no parameter or species 'nope'")]
    [InlineData("a=1:2:cubic:3", "lo:hi:lin:count")]
    [InlineData("K=0:10:log:3", "positive low end")]
    [InlineData("a=3:1:lin:3", "below its high end")]
    [InlineData("U=1.5,2", "whole number")]
    [InlineData("size=0,1", "positive")]
    [InlineData("a=1,x", "not a finite number")]
    public void A_spec_that_does_not_read_is_refused_with_the_reason(string text, string expected)
    {
        var e = Assert.Throws<ScanInputException>(() => ScanAxis.Parse(text, Toggle().Network));
        Assert.Contains(expected, e.Message);
    }

    [Fact]
    public void A_grid_holds_every_combination_with_the_last_name_fastest()
    {
        var network = Toggle().Network;
        var points = ScanDesign.Grid.Points([ScanAxis.Parse("a=1,2", network), ScanAxis.Parse("K=3,4,5", network)], seed: 1);
        Assert.Equal(6, points.Count);
        Assert.Equal([1.0, 3], points[0].Values);
        Assert.Equal([1.0, 4], points[1].Values);
        Assert.Equal([2.0, 5], points[5].Values);
    }

    [Fact]
    public void A_latin_hypercube_puts_one_point_in_every_stratum_of_every_range()
    {
        // The defining property of a Latin hypercube sample (McKay, Beckman & Conover 1979, Technometrics 21:239):
        // each of the N equal strata of each input holds exactly one of the N points.
        var network = Toggle().Network;
        var axes = new[] { ScanAxis.Parse("a=10:30:lin:2", network), ScanAxis.Parse("K=1:100:log:2", network) };
        const int n = 25;
        var points = ScanDesign.Parse("latin:25").Points(axes, seed: 42);
        Assert.Equal(n, points.Count);
        var linearStrata = points.Select(p => (int)Math.Floor((p.Values[0] - 10) / 20 * n)).Order().ToArray();
        var logStrata = points.Select(p => (int)Math.Floor(Math.Log10(p.Values[1]) / 2 * n)).Order().ToArray();
        Assert.Equal(Enumerable.Range(0, n), linearStrata);
        Assert.Equal(Enumerable.Range(0, n), logStrata);
        // The same seed gives the same design; another seed another pairing.
        Assert.Equal(points.Select(p => p.Values[0]), ScanDesign.Parse("latin:25").Points(axes, 42).Select(p => p.Values[0]));
        Assert.NotEqual(points.Select(p => p.Values[0]), ScanDesign.Parse("latin:25").Points(axes, 43).Select(p => p.Values[0]));
    }

    [Fact]
    public void A_point_model_holds_the_varied_values_in_its_own_text()
    {
        var model = Toggle();
        var axes = new[] { ScanAxis.Parse("a=12.5", model.Network), ScanAxis.Parse("V=7", model.Network), ScanAxis.Parse("size=3", model.Network) };
        var (point, size) = ScanModel.At(model, axes, new ScanPoint(0, [12.5, 7, 3]));
        Assert.Equal(12.5, point.Network.InitialParameterValues[point.Network.ParameterIndex("a")]);
        Assert.Equal(7 * 3, point.Network.InitialCounts[point.Network.SpeciesIndex("V")]); // the count as written, then scaled by Ω/Ω₀ = 3
        Assert.Equal(3.0, size);
        Assert.Equal(model.Text.Split('\n').Length, point.Text.Split('\n').Length);
        Assert.Contains("  a = 12.5          # largest synthesis rate", point.Text, StringComparison.Ordinal);
        Assert.Contains("  V = 7\n", point.Text, StringComparison.Ordinal);
    }
}
