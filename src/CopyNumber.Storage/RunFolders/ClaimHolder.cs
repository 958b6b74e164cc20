using System.Diagnostics;
using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace CopyNumber.Storage;

/// <summary>The run named in a folder's claim file: which command, which process on which host, since when.</summary>
/// <param name="Host">The host name (<see cref="Environment.MachineName"/>) of the holder.</param>
/// <param name="ProcessId">The holder's process id on <paramref name="Host"/>.</param>
/// <param name="ProcessStartedUtc">When that process started (UTC); tells a reused process id from the holder.</param>
/// <param name="SinceUtc">When the folder was claimed (UTC).</param>
/// <param name="Command">The command that holds it, e.g. <c>simulate</c>.</param>
public sealed record ClaimHolder(string Host, int ProcessId, DateTimeOffset ProcessStartedUtc, DateTimeOffset SinceUtc, string Command)
{
    /// <summary>Process start times read twice may differ by the clock's rounding; a reused id starts far later.</summary>
    private static readonly TimeSpan StartTolerance = TimeSpan.FromSeconds(1);

    /// <summary>This process, claiming now for <paramref name="command"/>.</summary>
    public static ClaimHolder Current(string command)
    {
        using var self = Process.GetCurrentProcess();
        return new ClaimHolder(Environment.MachineName, Environment.ProcessId, new DateTimeOffset(self.StartTime.ToUniversalTime()), DateTimeOffset.UtcNow, command);
    }

    /// <summary>Whether the holder runs (or ran) on this host, so its process can be looked up here.</summary>
    public bool OnThisHost => string.Equals(Host, Environment.MachineName, StringComparison.OrdinalIgnoreCase);

    /// <summary>
    /// True only when the holder is on this host and no process with its id and start time runs any more.
    /// A holder on another host is never known to be gone: this host cannot see its processes.
    /// </summary>
    public bool IsGone
    {
        get
        {
            if (!OnThisHost) return false;
            try
            {
                using var process = Process.GetProcessById(ProcessId);
                if (process.HasExited) return true;
                return (new DateTimeOffset(process.StartTime.ToUniversalTime()) - ProcessStartedUtc).Duration() > StartTolerance;
            }
            catch (ArgumentException)
            {
                return true; // no process with that id
            }
            catch (InvalidOperationException)
            {
                return true; // it exited while we looked
            }
            catch (System.ComponentModel.Win32Exception)
            {
                return false; // not ours to inspect: assume it runs
            }
        }
    }

    /// <summary>One phrase for messages: "simulate, process 4242 on host node17, since 2025-01-31 08:15:02 UTC".</summary>
    public string Describe() =>
        $"{Command}, process {ProcessId.ToString(CultureInfo.InvariantCulture)} on host {Host}, since {SinceUtc.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture)} UTC";

    /// <summary>The claim file's text: one JSON object.</summary>
    public string ToJson() => new JsonObject
    {
        ["host"] = Host,
        ["process_id"] = ProcessId,
        ["process_started_utc"] = ProcessStartedUtc.UtcDateTime.ToString("O", CultureInfo.InvariantCulture),
        ["since_utc"] = SinceUtc.UtcDateTime.ToString("O", CultureInfo.InvariantCulture),
        ["command"] = Command,
    }.ToJsonString(new JsonSerializerOptions { WriteIndented = true }) + "\n";

    /// <summary>Reads a claim file's text; null when it is not a claim (empty, cut short, edited).</summary>
    public static ClaimHolder? Parse(string text)
    {
        try
        {
            if (JsonNode.Parse(text) is not JsonObject o) return null;
            var host = (string?)o["host"];
            var command = (string?)o["command"];
            if (host is null || command is null || o["process_id"] is null) return null;
            return new ClaimHolder(host, (int)o["process_id"]!,
                DateTimeOffset.Parse((string)o["process_started_utc"]!, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal),
                DateTimeOffset.Parse((string)o["since_utc"]!, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal),
                command);
        }
        catch (Exception e) when (e is JsonException or FormatException or InvalidOperationException or NullReferenceException or ArgumentException)
        {
            return null;
        }
    }
}
