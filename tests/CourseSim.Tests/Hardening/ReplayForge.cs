using System.Security.Cryptography;
using MessagePack;

namespace CourseSim.Tests.Hardening;

/// <summary>Makes hostile replays from a good one: the payload decoded to plain maps and lists, changed, re-sealed.</summary>
public static class ReplayForge
{
    public static Dictionary<object, object> Payload(byte[] replay)
    {
        var env = (Dictionary<object, object>)MessagePackSerializer.Deserialize<object>(replay)!;
        return (Dictionary<object, object>)MessagePackSerializer.Deserialize<object>((byte[])env["payload"])!;
    }

    /// <summary>A replay with this payload and a valid checksum (so only the reader's checks stand in the way).</summary>
    public static byte[] Seal(Dictionary<object, object> payload, object? version = null) => SealBytes(MessagePackSerializer.Serialize<object>(payload), version);

    public static byte[] SealBytes(byte[] payload, object? version = null) =>
        MessagePackSerializer.Serialize<object>(new Dictionary<object, object>
        {
            ["format"] = CourseSim.Replay.ReplayFile.Format, ["version"] = version ?? 1, ["payload"] = payload, ["sha256"] = SHA256.HashData(payload),
        });
}
