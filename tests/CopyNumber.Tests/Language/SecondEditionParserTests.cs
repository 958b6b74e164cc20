using CopyNumber.Kinetics;
using CopyNumber.Language;
using static CopyNumber.Tests.Language.LanguageTestSupport;

namespace CopyNumber.Tests.Language;

// The second edition's forms read into the expected syntax tree; the expected trees are written out from
// the grammar in docs/network-language.md.
public sealed class SecondEditionParserTests
{
    private const string Everything = """
        time unit minute
        size 2
        size unit litre

        species
          P = 40
          D = 0
          S = 12.5 held
          held = 3

        parameters
          kf = 0.02
          kr = 0.5

        reactions
          pair: 2 P -> D  mass kf  back mass kr
          bind: P + S -> D  rate kf * P * S  back rate kr * D
          gate: 0 -> P  rate choose(D >= 10 or not P < 5, kf, 0)

        changes
          kf = 20  at time 50
          P = P / 2, D += 1  every 30 from 30 until 300
          D -= 1  every 7
          P = 100, D = 0  whenever D > 30 and P != 0

        readouts
          bound = D + (P == 0)
        """;

    [Fact]
    public void Every_second_edition_form_parses_into_the_expected_tree()
    {
        var model = ParseValid(Everything);
        Assert.Equal(("minute", "litre", 2.0), (model.TimeUnit, model.SizeUnit, model.Size));

        Assert.Equal([("P", false, (double?)null), ("D", false, null), ("S", true, 12.5), ("held", false, null)],
            model.Species.Select(s => (s.Name, s.Fixed, s.FractionalAmount)));

        var pair = model.Reactions[0];
        Assert.True(pair.Reversible);
        Assert.Equal((LawKind.Mass, LawKind.Mass), (pair.Law, pair.BackLaw));
        Assert.Equal(("kf", "kr"), (ExpressionText.Format(pair.Forward), ExpressionText.Format(pair.Reverse!)));
        var bind = model.Reactions[1];
        Assert.Equal((LawKind.Rate, LawKind.Rate), (bind.Law, bind.BackLaw));
        Assert.Equal("kr * D", ExpressionText.Format(bind.Reverse!));
        var gate = model.Reactions[2];
        Assert.False(gate.Reversible);
        var choose = Assert.IsType<CallExpr>(gate.Forward);
        Assert.Equal("choose", choose.Function);
        var or = Assert.IsType<LogicExpr>(choose.Arguments[0]);
        Assert.False(or.Conjunction);
        Assert.Equal(Comparison.GreaterOrEqual, Assert.IsType<CompareExpr>(or.Left).Operator);
        var not = Assert.IsType<NotExpr>(or.Right);
        Assert.Equal(Comparison.Less, Assert.IsType<CompareExpr>(not.Operand).Operator);

        // timed changes: one declaration per assignment, in order, with the line's timing
        Assert.Equal(["kf", "P", "D", "D"], model.Schedule.Select(s => s.Target));
        Assert.Equal([ScheduleOperation.Set, ScheduleOperation.Set, ScheduleOperation.Add, ScheduleOperation.Subtract],
            model.Schedule.Select(s => s.Operation));
        Assert.Equal(["50", "30", "30", "7"], model.Schedule.Select(s => ExpressionText.Format(s.Time)));
        Assert.Equal([null, "30", "30", "7"], model.Schedule.Select(s => s.Every is null ? null : ExpressionText.Format(s.Every)));
        Assert.Equal([null, "300", "300", null], model.Schedule.Select(s => s.Until is null ? null : ExpressionText.Format(s.Until)));

        var trigger = Assert.Single(model.TriggerLines);
        Assert.Equal(["P", "D"], trigger.Assignments.Select(a => a.Target));
        Assert.Equal("D > 30 and P != 0", ExpressionText.Format(trigger.Condition));
        Assert.Equal(24, trigger.Position.Line);

        Assert.Equal("D + (P == 0)", ExpressionText.Format(model.Readouts[0].Value));
    }

    [Theory]
    // loosest first: or, and, not, comparison, then arithmetic
    [InlineData("a < b or c > d and not e == f", "a < b or c > d and not e == f")]
    [InlineData("(a or b) and c", "(a or b) and c")]
    [InlineData("not (a and b)", "not (a and b)")]
    [InlineData("a + 1 <= 2 * b", "a + 1 <= 2 * b")]
    [InlineData("(a < b) * 3", "(a < b) * 3")]
    [InlineData("a >-1", "a > -1")]
    [InlineData("a ==-1", "a == -1")]
    [InlineData("a != b", "a != b")]
    [InlineData("choose(a > b, a, b)", "choose(a > b, a, b)")]
    public void Conditions_parse_with_the_documented_precedence_and_print_back(string text, string printed)
    {
        var model = ParseValid($"species\n  a = 1\n  b = 2\n  c = 3\n  d = 4\n  e = 5\n  f = 6\nreactions\n  r: a -> 0  rate {text}\n");
        Assert.Equal(printed, ExpressionText.Format(model.Reactions[0].Forward));
        // printed text reads back to the same value at a sample state
        var again = ParseValid($"species\n  a = 1\n  b = 2\n  c = 3\n  d = 4\n  e = 5\n  f = 6\nreactions\n  r: a -> 0  rate {printed}\n");
        double? Value(string n) => n switch { "a" => 1, "b" => 2, "c" => 3, "d" => 4, "e" => 5, "f" => 6, _ => null };
        Assert.Equal(ConstantEvaluator.Evaluate(model.Reactions[0].Forward, Value), ConstantEvaluator.Evaluate(again.Reactions[0].Forward, Value));
    }

    [Fact]
    public void And_or_not_and_the_timing_words_stay_usable_as_names()
    {
        var model = ParseValid("""
            species
              and = 1
              not = 2
              every = 3
              whenever = 4
              back = 5
            reactions
              r: and -> not  mass 1  back mass 2
              s: every -> back  rate not + every
            changes
              whenever = not  at time 1
              back += and  whenever every > not or and < 1
            """);
        Assert.Equal("not + every", ExpressionText.Format(model.Reactions[1].Forward));
        Assert.Equal("every > not or and < 1", ExpressionText.Format(model.TriggerLines[0].Condition));
    }

    [Fact]
    public void A_first_edition_file_and_its_suggested_lines_give_the_same_model()
    {
        // Each suggestion, pasted in place of the line it was given for, yields a valid model.
        const string old = "species\n  A = 20\n  B = 0\nreactions\n  pair: 2 A <-> B  mass 0.01, 0.5\nschedule\n  at 5: A += 4\n";
        var outcome = ModelSource.Parse(old, "old.cnet");
        Assert.Equal(3, outcome.Diagnostics.Count);
        string Quoted(string message) => message[(message.LastIndexOf(": '", StringComparison.Ordinal) + 3)..^1];
        var fixedText = $"species\n  A = 20\n  B = 0\nreactions\n  {Quoted(outcome.Diagnostics[0].Message)}\nchanges\n  {Quoted(outcome.Diagnostics[2].Message)}\n";
        var model = ParseValid(fixedText);
        Assert.True(model.Reactions[0].Reversible);
        Assert.Equal(("A", ScheduleOperation.Add, "4", "5"),
            (model.Schedule[0].Target, model.Schedule[0].Operation, ExpressionText.Format(model.Schedule[0].Value), ExpressionText.Format(model.Schedule[0].Time)));
    }
}
