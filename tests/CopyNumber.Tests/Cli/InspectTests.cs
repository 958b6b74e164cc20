using System.Text.Json;

namespace CopyNumber.Tests.Cli;

public class InspectTests
{
    [Theory]
    [MemberData(nameof(CliRun.ScenarioNames), MemberType = typeof(CliRun))]
    public void Every_bundled_scenario_prints_N_its_rank_and_its_conservation_laws(string scenario)
    {
        var run = CliRun.Of("inspect", CliRun.Scenario(scenario));
        Assert.Equal(0, run.ExitCode);
        Assert.Contains("stoichiometric matrix N", run.Output);
        Assert.Contains("rank of N:", run.Output);
        Assert.Contains("conservation laws", run.Output);
        Assert.Equal("", run.Error);
    }

    [Fact]
    public void The_promoter_model_has_the_gene_copy_law_worked_out_by_hand()
    {
        // By hand from the model: promoter_on and promoter_off only move one gene copy between g_off and
        // g_on, and no other reaction touches either, so g_off + g_on is conserved at its initial value 1;
        // mRNA and protein have a source and a sink each, so rank N = 4 species − 1 law = 3.
        var run = CliRun.Of("inspect", CliRun.Scenario("promoter_switch.cnet"));
        Assert.Contains("g_off + g_on = 1", run.Output);
        Assert.Contains("rank of N: 3 of 4 species", run.Output);
        var matrixRow = run.Output.Split('\n').Single(l => l.StartsWith("mrna ", StringComparison.Ordinal) && l.Contains('-'));
        // Columns: promoter_on, promoter_off, transcription, translation, mrna_decay, protein_decay.
        Assert.Equal(["mrna", "0", "0", "1", "0", "-1", "0"], matrixRow.Split(' ', StringSplitOptions.RemoveEmptyEntries));
    }

    [Fact]
    public void Json_output_has_the_documented_field_names_and_N_by_rows()
    {
        var run = CliRun.Of("inspect", CliRun.Scenario("promoter_switch.cnet"), "--json");
        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Output);
        var root = json.RootElement;
        foreach (var field in new[] { "model", "size", "species", "parameters", "reactions", "stoichiometry", "rank", "conservation_laws", "dependent_species", "unchanged_species", "readouts", "schedule" })
            Assert.True(root.TryGetProperty(field, out _), $"missing field {field}");
        Assert.Equal(3, root.GetProperty("rank").GetInt32());
        var n = root.GetProperty("stoichiometry");
        Assert.Equal(4, n.GetArrayLength());
        Assert.Equal(6, n[0].GetArrayLength());
        // protein row, by hand: made by translation, removed by protein_decay.
        Assert.Equal([0L, 0, 0, 1, 0, -1], n[3].EnumerateArray().Select(e => e.GetInt64()).ToArray());
        var law = root.GetProperty("conservation_laws")[0];
        Assert.Equal(1, law.GetProperty("total").GetInt64());
        Assert.Equal(1, law.GetProperty("coefficients").GetProperty("g_off").GetInt64());
    }

    [Fact]
    public void Json_output_writes_reaction_arrows_as_they_are_typed()
    {
        // Issue 16: the reactions read "g_off -\u003E g_on" in the raw text. JSON (RFC 8259, common practice)
        // requires escaping only quotes, backslashes and control characters, so '>' stays as typed.
        var run = CliRun.Of("inspect", CliRun.Scenario("promoter_switch.cnet"), "--json");
        Assert.Equal(0, run.ExitCode);
        Assert.DoesNotContain("\\u003E", run.Output, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("g_off -> g_on", run.Output);
        using var json = JsonDocument.Parse(run.Output);
        Assert.Contains(json.RootElement.GetProperty("reactions").EnumerateArray(), r => r.ToString().Contains("g_off -> g_on", StringComparison.Ordinal));
    }

    [Fact]
    public void Inspect_shows_what_each_timed_change_sets_and_the_conservation_laws_it_breaks()
    {
        // Issue 16: the schedule table said only "set". By hand from the model: A + B = 10 is conserved by
        // the isomerisation, so adding 5 to A moves the law's total (to 15); the parameter change and a
        // change of C (in no law) break nothing. A repeating change shows its period and last time.
        var path = Path.Combine(Path.GetTempPath(), $"copynumber-changes-{Guid.NewGuid():N}.cnet");
        File.WriteAllText(path, """
            species
              A = 10
              B = 0
              C = 0
            parameters
              k = 1
            reactions
              flip: A -> B mass k
              flop: B -> A mass k
              make: 0 -> C mass k
            changes
              A += 5 at time 20
              k = 2 at time 30
              C = C / 2 every 10 from 5 until 45
            """);
        try
        {
            var run = CliRun.Of("inspect", path);
            Assert.Equal(0, run.ExitCode);
            var lines = run.Output.Split('\n');
            var addA = lines.Single(l => l.Contains("A += 5", StringComparison.Ordinal));
            Assert.Contains("A + B = 10", addA);
            Assert.Contains("-", lines.Single(l => l.Contains("k = 2", StringComparison.Ordinal)).Split("k = 2")[1]);
            var halve = lines.Single(l => l.Contains("C = C / 2", StringComparison.Ordinal));
            Assert.StartsWith("5 every 10 until 45", halve.TrimStart());
            Assert.DoesNotContain("A + B", halve);

            using var json = JsonDocument.Parse(CliRun.Of("inspect", path, "--json").Output);
            var schedule = json.RootElement.GetProperty("schedule").EnumerateArray().ToDictionary(c => c.GetProperty("text").GetString()!);
            Assert.Equal(["A += 5", "C = C / 2", "k = 2"], schedule.Keys.Order(StringComparer.Ordinal));
            Assert.Equal(["A + B = 10"], schedule["A += 5"].GetProperty("breaks").EnumerateArray().Select(e => e.GetString()));
            Assert.Equal(0, schedule["k = 2"].GetProperty("breaks").GetArrayLength());
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void A_model_with_errors_gives_exit_code_2_with_located_messages_and_no_stack_trace()
    {
        var path = Path.Combine(Path.GetTempPath(), $"copynumber-bad-{Guid.NewGuid():N}.cnet");
        File.WriteAllText(path, "species\n  A = 10\nreactions\n  decay: A -> 0 mass kk\n");
        try
        {
            var run = CliRun.Of("inspect", path);
            Assert.Equal(2, run.ExitCode);
            Assert.Contains($"{path}:4:", run.Error);
            Assert.Contains("error:", run.Error);
            Assert.DoesNotContain("   at ", run.Error);
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void A_missing_model_file_is_bad_input()
    {
        var run = CliRun.Of("inspect", "/nonexistent/model.cnet");
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("model file '/nonexistent/model.cnet' not found", run.Error); // docs/network-language.md, file errors
    }

    /// <summary>
    /// A 30 000-reaction chain (issue 10, fault 8): its dense N has 9·10⁸ entries, and the exact analysis of
    /// it once ran for over ten minutes, passed 14 GB and ended in an out-of-memory error. Now the structure
    /// is left out with a note, and the chain's one conservation law is not claimed. That a chain of
    /// conversions changes every species is common practice (each species is a reactant or a product).
    /// </summary>
    [Fact]
    public void A_network_too_large_for_the_exact_structure_is_described_without_it()
    {
        var text = new System.Text.StringBuilder("# illustrative: a very long chain of conversions\nspecies\n");
        for (var i = 0; i <= 30_000; i++) text.Append($"  S{i} = {(i == 0 ? 10 : 0)}\n");
        text.Append("reactions\n");
        for (var i = 0; i < 30_000; i++) text.Append($"  r{i}: S{i} -> S{i + 1} mass 1\n");
        var path = Path.Combine(Path.GetTempPath(), $"copynumber-chain-{Guid.NewGuid():N}.cnet");
        File.WriteAllText(path, text.ToString());
        try
        {
            var run = CliRun.Of("inspect", path);
            Assert.Equal(0, run.ExitCode);
            Assert.Contains("note: the exact structure of N (rank, conservation laws) is not analysed: N has 900,030,000 entries", run.Output);
            Assert.DoesNotContain("rank of N", run.Output);
            Assert.DoesNotContain("species no reaction changes", run.Output);
            var json = CliRun.Of("inspect", path, "--json");
            Assert.Equal(0, json.ExitCode);
            using var document = System.Text.Json.JsonDocument.Parse(json.Output);
            Assert.Equal(System.Text.Json.JsonValueKind.Null, document.RootElement.GetProperty("rank").ValueKind);
            Assert.Equal(System.Text.Json.JsonValueKind.Null, document.RootElement.GetProperty("stoichiometry").ValueKind);
            Assert.StartsWith("the exact structure of N", document.RootElement.GetProperty("structure_note").GetString());
        }
        finally
        {
            File.Delete(path);
        }
    }
}
