using System.CommandLine;
using System.Text;
using CopyNumber.Cli.Rendering;
using CopyNumber.Network;

namespace CopyNumber.Cli.Commands;

/// <summary><c>copynumber inspect MODEL [--json]</c>: what the network is, before anything is simulated.</summary>
internal static class InspectCommand
{
    public static Command Create()
    {
        var model = ModelArgument.Create();
        var json = new Option<bool>("--json") { Description = "Print the description as JSON (field names in docs/inspect-json.md)." };
        var command = new Command("inspect", "Show species, parameters, reactions, the stoichiometric matrix N, its rank and the conservation laws.");
        command.Arguments.Add(model);
        command.Options.Add(json);
        command.SetAction(parsed =>
        {
            var loaded = ModelArgument.Load(parsed.GetValue(model)!, warnings: parsed.InvocationConfiguration.Error);
            var description = NetworkDescription.Of(loaded.Network);
            parsed.InvocationConfiguration.Output.Write(parsed.GetValue(json) ? description.ToJson() + "\n" : Render(description));
            return ExitCodes.Done;
        });
        return command;
    }

    internal static string Render(NetworkDescription d)
    {
        var text = new StringBuilder();
        text.Append($"model {d.Model}   size {Numbers.Format(d.Size)}   {d.Species.Count} species, {d.Reactions.Count} reactions\n\n");

        var species = new TextTable("species", "initial");
        foreach (var s in d.Species) species.Add(s.Name, s.Initial.ToString());
        text.Append(species).Append('\n');

        if (d.Parameters.Count > 0)
        {
            var parameters = new TextTable("parameter", "value");
            foreach (var p in d.Parameters) parameters.Add(p.Name, Numbers.Format(p.Value, 6));
            text.Append(parameters).Append('\n');
        }

        var reactions = new TextTable("reaction", "equation", "law");
        foreach (var r in d.Reactions) reactions.Add(r.Name, r.Equation, $"{r.Law} {r.Expression}");
        text.Append(reactions).Append('\n');

        if (d.Stoichiometry is null || d.Rank is null)
        {
            text.Append($"note: {d.StructureNote}\n");
        }
        else
        {
            text.Append("stoichiometric matrix N (rows: species, columns: reactions)\n");
            var matrix = new TextTable(d.Reactions.Select(r => r.Name).Prepend("").ToArray());
            for (var i = 0; i < d.Species.Count; i++)
                matrix.Add(d.Stoichiometry[i].Select(v => v.ToString()).Prepend(d.Species[i].Name).ToArray());
            text.Append(matrix).Append('\n');
            text.Append($"rank of N: {d.Rank} of {d.Species.Count} species\n");
        }
        if (d.Rank is not null && d.ConservationLaws.Count == 0)
            text.Append("conservation laws: none (every species can change independently)\n");
        else if (d.Rank is not null)
        {
            text.Append($"conservation laws ({d.ConservationLaws.Count}):\n");
            foreach (var law in d.ConservationLaws) text.Append($"  {law.Text}\n");
            text.Append($"dependent species: {string.Join(", ", d.DependentSpecies)}\n");
        }
        if (d.UnchangedSpecies.Count > 0)
            text.Append($"species no reaction changes: {string.Join(", ", d.UnchangedSpecies)}\n");
        if (d.CellCycle is { } cycle) text.Append($"cell cycle: {cycle}\n");

        if (d.Readouts.Count > 0)
        {
            text.Append('\n');
            var readouts = new TextTable("readout", "expression", "kind");
            foreach (var r in d.Readouts) readouts.Add(r.Name, r.Expression, r.IsCount ? "count" : "real");
            text.Append(readouts);
        }
        if (d.Schedule.Count > 0)
        {
            text.Append('\n');
            var schedule = new TextTable("at", "change", "breaks");
            foreach (var s in d.Schedule)
                schedule.Add(When(s), s.Text, s.Breaks.Count == 0 ? "-" : string.Join("; ", s.Breaks));
            text.Append(schedule);
            if (d.Schedule.Any(s => s.Breaks.Count > 0))
                text.Append("a change that breaks a conservation law moves its total; the law holds again after it, with the new total\n");
        }
        if (d.Triggers.Count > 0)
        {
            text.Append("\nchanges when a condition turns true:\n");
            foreach (var t in d.Triggers) text.Append($"  {t}\n");
        }
        return text.ToString();
    }

    private static string When(ScheduleDescription s) => s.Every is not { } every
        ? Numbers.Format(s.Time, 6)
        : $"{Numbers.Format(s.Time, 6)} every {Numbers.Format(every, 6)}" + (s.Until is { } until ? $" until {Numbers.Format(until, 6)}" : "");
}
