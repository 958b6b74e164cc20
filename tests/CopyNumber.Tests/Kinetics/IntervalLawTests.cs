using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Tests.Kinetics;

/// <summary>
/// The interval enclosure of a law over a window of time must hold every value the law takes there (the
/// defining property of interval arithmetic; Moore, Kearfott &amp; Cloud 2009, quoted from memory): checked
/// against the law evaluated at 2 001 points of each of 300 random windows, by the compiled law itself.
/// </summary>
public sealed class IntervalLawTests
{
    /// <summary>A law as the parser reads it, in a model with species A and parameters k, w.</summary>
    private static Expr Law(string text)
    {
        var outcome = ModelSource.Parse($"species\n  A = 1\nparameters\n  k = 2\n  w = 1\nreactions\n  r: A -> 0  rate {text}\n", "law.cnet");
        Assert.True(outcome.Succeeded, string.Join("\n", outcome.Diagnostics.Select(d => d.Format())));
        return outcome.Model!.Reactions[0].Forward;
    }

    [Theory]
    [InlineData("k * (1 + 0.9 * sin(w * time)) * A")]
    [InlineData("k * cos(w * time)^2 + A / (1 + time)")]
    [InlineData("hill_act(A * (2 + sin(time)), 5, 2) * exp(-0.1 * time)")]
    [InlineData("choose(sin(w * time) > 0, k * A, 1) + mm(time, 3) + abs(cos(3 * time) - 0.5)")]
    [InlineData("max(sin(time), cos(time)) + 2 + sqrt(time) * (time < 7)")]
    public void EnclosureHoldsEveryValueOnTheWindow(string law)
    {
        var expression = Law(law);
        var scope = new ExpressionScope(["A"], ["k", "w"], 1.0);
        var bound = IntervalLaw.Compile(expression, scope);
        var compiled = ExpressionCompiler.CompileCountLaw(expression, scope);
        var random = new Random(11);
        var counts = new long[1];
        var parameters = new double[3];
        for (var trial = 0; trial < 300; trial++)
        {
            counts[0] = random.Next(0, 50);
            parameters[0] = random.NextDouble() * 3;
            parameters[1] = random.NextDouble() * 4;
            var t0 = random.NextDouble() * 20;
            var t1 = t0 + random.NextDouble() * (trial % 3 == 0 ? 10 : 0.5);
            var range = bound.Evaluate(counts, parameters, t0, t1);
            for (var i = 0; i <= 2000; i++)
            {
                parameters[2] = t0 + (t1 - t0) * i / 2000;
                var value = compiled(counts, parameters);
                var slack = 1e-12 * (1 + Math.Abs(value));
                Assert.True(range.Lo - slack <= value && value <= range.Hi + slack,
                    $"{law} at t = {parameters[2]} is {value}, outside [{range.Lo}, {range.Hi}] on [{t0}, {t1}]");
            }
        }
    }

    [Fact]
    public void SineEnclosureIsTightWhereNoExtremumLiesInside()
    {
        // On [0.1, 0.2] sin rises, so the enclosure is exactly [sin 0.1, sin 0.2]: no extremum inside.
        var bound = IntervalLaw.Compile(Law("sin(time)"), new ExpressionScope(["A"], ["k", "w"], 1.0));
        var range = bound.Evaluate([0], [0.0, 0.0, 0.0], 0.1, 0.2);
        Assert.Equal(Math.Sin(0.1), range.Lo, 15);
        Assert.Equal(Math.Sin(0.2), range.Hi, 15);
        var peak = bound.Evaluate([0], [0.0, 0.0, 0.0], 1.5, 1.6); // π/2 inside
        Assert.Equal(1.0, peak.Hi);
    }
}
