using CopyNumber.Language;
using static CopyNumber.Tests.Language.LanguageTestSupport;

namespace CopyNumber.Tests.Language;

// Random mutation of valid inputs to check that a parser fails gracefully is common practice
// (mutation-based fuzzing). The seed is fixed, so every run checks the same mutants.
public sealed class ParserFuzzTests
{
    // 4 scenarios × 1250 = 5000 mutants in all.
    private const int MutantsPerScenario = 1250;
    private const string Alphabet = "abzAZ_09.e+-*/^()<>=,:#;$\"' \t\n\r\u00b5";

    [Fact]
    public void MutatedScenariosAlwaysYieldAnOutcomeWithWellFormedDiagnostics()
    {
        var random = new Random(20_260_311);
        var files = ScenarioFiles();
        Assert.True(files.Count >= 4, "the bundled scenarios are missing");
        int rejected = 0, accepted = 0;
        foreach (var file in files)
        {
            var original = File.ReadAllText(file);
            for (var m = 0; m < MutantsPerScenario; m++)
            {
                var text = original;
                var mutations = 1 + random.Next(4);
                for (var k = 0; k < mutations; k++) text = Mutate(text, random);
                var outcome = ModelSource.Parse(text, "mutant.cnet");
                CheckOutcome(outcome, text, "mutant.cnet");
                if (outcome.Succeeded) accepted++; else rejected++;
                if (m % 50 == 0)
                {
                    // Same text, same report: nothing depends on hidden state.
                    var again = ModelSource.Parse(text, "mutant.cnet");
                    Assert.Equal(outcome.Diagnostics.Select(d => d.Format()), again.Diagnostics.Select(d => d.Format()));
                }
            }
        }
        // Most random edits break a model; some (in comments, spacing, values) do not.
        Assert.True(rejected > accepted, $"{rejected} rejected, {accepted} accepted");
        Assert.True(accepted > 0, "no mutant survived: the mutations never touch harmless text?");
    }

    [Theory]
    [InlineData("(")]
    [InlineData("-")]
    [InlineData("-=")]
    [InlineData("<")]
    [InlineData("2^")]
    [InlineData("a")]
    [InlineData("1e")]
    [InlineData("f(")]
    [InlineData("A + ")]
    public void PathologicallyLongLinesAreRejectedWithoutExhaustingTheStack(string repeated)
    {
        // 50 000 characters on one line: a parser that recursed per character would overflow the
        // stack, and one that rescanned the line per token would take billions of steps.
        var longText = string.Concat(Enumerable.Repeat(repeated, 50_000 / repeated.Length));
        foreach (var text in new[]
                 {
                     $"species\n A = 1\nparameters\n k = {longText}\nreactions\n r: A -> 0 mass 1\n",
                     $"species\n A = 1\nreactions\n r: {longText} -> A mass 1\n",
                     $"species\n A = 1\nreactions\n r: A -> 0 rate {longText}\n",
                     longText,
                 })
        {
            var outcome = ModelSource.Parse(text, "long.cnet");
            CheckOutcome(outcome, text, "long.cnet");
            Assert.False(outcome.Succeeded);
        }
    }

    private static void CheckOutcome(ParseOutcome outcome, string text, string file)
    {
        Assert.Equal(outcome.Diagnostics.Count == 0, outcome.Succeeded);
        Assert.Equal(outcome.Diagnostics.Count == 0, outcome.Model is not null);
        var lines = text.Replace("\r\n", "\n").Replace('\r', '\n').Split('\n');
        var previousLine = 0;
        foreach (var d in outcome.Diagnostics)
        {
            Assert.Equal(file, d.File);
            Assert.InRange(d.Position.Line, 1, lines.Length);
            var source = lines[d.Position.Line - 1];
            Assert.Equal(source, d.SourceLine);
            Assert.InRange(d.Position.Column, 1, source.Length + 1);
            Assert.True(d.Position.Length >= 1);
            Assert.False(string.IsNullOrWhiteSpace(d.Message));
            Assert.True(d.Position.Line >= previousLine, "diagnostics out of line order");
            previousLine = d.Position.Line;
            Assert.StartsWith($"{d.File}:{d.Position.Line}:{d.Position.Column}: error: ", d.Format());
        }
    }

    private static string Mutate(string text, Random random)
    {
        if (text.Length == 0) return Alphabet[random.Next(Alphabet.Length)].ToString();
        var at = random.Next(text.Length);
        switch (random.Next(9))
        {
            case 0: // delete a character
                return text.Remove(at, 1);
            case 1: // insert a character
                return text.Insert(at, Alphabet[random.Next(Alphabet.Length)].ToString());
            case 2: // duplicate a stretch of characters
            {
                var length = Math.Min(1 + random.Next(12), text.Length - at);
                return text.Insert(at, text.Substring(at, length));
            }
            case 3: // swap two neighbouring characters
                if (at + 1 >= text.Length) return text;
                return string.Concat(text.AsSpan(0, at), text.AsSpan(at + 1, 1), text.AsSpan(at, 1), text.AsSpan(at + 2));
            case 4: // truncate a line at a random place
            {
                var end = text.IndexOf('\n', at);
                return end < 0 ? text[..at] : text.Remove(at, end - at);
            }
            case 5: // delete a line
            {
                var lines = text.Split('\n').ToList();
                lines.RemoveAt(random.Next(lines.Count));
                return string.Join('\n', lines);
            }
            default: // token edits: delete, duplicate or swap whole words and symbols
            {
                var tokens = SplitTokens(text);
                if (tokens.Count < 2) return text;
                var i = random.Next(tokens.Count - 1);
                switch (random.Next(3))
                {
                    case 0: tokens.RemoveAt(i); break;
                    case 1: tokens.Insert(i, tokens[random.Next(tokens.Count)]); break;
                    default: (tokens[i], tokens[i + 1]) = (tokens[i + 1], tokens[i]); break;
                }
                return string.Concat(tokens);
            }
        }
    }

    // Words, numbers, single symbols and runs of white space, in order; concatenated they give the text back.
    private static List<string> SplitTokens(string text)
    {
        var tokens = new List<string>();
        var i = 0;
        while (i < text.Length)
        {
            var start = i;
            if (char.IsLetterOrDigit(text[i]) || text[i] is '_' or '.')
                while (i < text.Length && (char.IsLetterOrDigit(text[i]) || text[i] is '_' or '.')) i++;
            else if (text[i] is ' ' or '\t')
                while (i < text.Length && text[i] is ' ' or '\t') i++;
            else
                i++;
            tokens.Add(text[start..i]);
        }
        return tokens;
    }
}
