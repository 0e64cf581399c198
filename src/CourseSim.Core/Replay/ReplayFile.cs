using System.Buffers;
using System.Buffers.Binary;
using System.Security.Cryptography;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Simulation;
using MessagePack;

namespace CourseSim.Replay;

/// <summary>
/// The replay file (docs/replay.md): MessagePack, an envelope map {format, version, payload, sha256} whose payload is the
/// MessagePack-encoded race and whose sha256 is the SHA-256 of the payload bytes, so truncation or corruption is
/// detected before anything is shown. Sample columns are float32 little-endian blobs (compact, fast to read in a
/// browser). Writing is deterministic: the same race gives the same bytes.
/// </summary>
public static class ReplayFile
{
    public const string Format = "coursesim-replay";
    public const int Version = 1;
    /// <summary>Sample columns in the order written.</summary>
    public static readonly string[] ColumnNames = ["x_m", "y_m", "heading_deg", "speed_ms", "leeway_deg", "attack_deg", "heel_use",
        "twa_deg", "awa_deg", "tws_ms", "twd_deg", "sheet", "reserve"];
    /// <summary>Wind grid for display: cells across the course box and the interval between wind frames.</summary>
    public const int WindCells = 32;
    public const double WindIntervalS = 5;

    public static byte[] Write(Race race, RaceResult result)
    {
        var payload = new ArrayBufferWriter<byte>(1 << 16);
        var w = new MessagePackWriter(payload);
        var s = race.Setup;
        var rec = race.Recorder;
        int n = race.BoardCount;
        w.WriteMapHeader(20);
        w.Write("engine"); w.Write(Race.EngineVersion);
        w.Write("scenario"); w.Write(s.Name);
        w.Write("venue"); w.Write(s.VenueName);
        w.Write("origin_lat_deg"); w.Write(s.LatDeg);
        w.Write("origin_lon_deg"); w.Write(s.LonDeg);
        w.Write("seed"); w.Write(race.Seed);
        w.Write("start_time_utc"); w.Write(s.Race.StartTimeUtc.ToString("yyyy-MM-ddTHH:mm:ssZ", System.Globalization.CultureInfo.InvariantCulture));
        w.Write("step_hz"); w.Write(s.Race.StepHz);
        w.Write("interval_s"); w.Write(rec.IntervalS);
        w.Write("start_s"); w.Write(rec.StartS);
        w.Write("frames"); w.Write(rec.Frames);
        w.Write("boards");
        w.WriteArrayHeader(n);
        for (int b = 0; b < n; b++)
        {
            var e = s.Boards[b];
            w.WriteMapHeader(5);
            w.Write("name"); w.Write(e.Name);
            w.Write("equipment"); w.Write(e.Equipment.Name);
            w.Write("sail_m2"); w.Write(e.Equipment.Sail.AreaM2);
            w.Write("rider_kg"); w.Write(e.Equipment.Rider.MassKg);
            w.Write("skill"); w.Write(e.Equipment.Rider.Skill);
        }
        WriteCourse(ref w, race.Course);
        w.Write("columns");
        w.WriteMapHeader(ColumnNames.Length);
        var blob = new byte[rec.Frames * n * 4];
        for (int c = 0; c < ColumnNames.Length; c++)
        {
            for (int k = 0; k < rec.Frames; k++)
            {
                var row = rec.Frame(k);
                for (int b = 0; b < n; b++) BinaryPrimitives.WriteSingleLittleEndian(blob.AsSpan((k * n + b) * 4), Pick(row[b], c));
            }
            w.Write(ColumnNames[c]); w.Write(blob);
        }
        var flags = new byte[rec.Frames * n]; var next = new byte[rec.Frames * n];
        for (int k = 0; k < rec.Frames; k++)
        {
            var row = rec.Frame(k);
            for (int b = 0; b < n; b++) { flags[k * n + b] = row[b].Flags; next[k * n + b] = row[b].NextStep; }
        }
        w.Write("flags"); w.Write(flags);
        w.Write("next_step"); w.Write(next);
        w.Write("events");
        w.WriteArrayHeader(result.Events.Count);
        foreach (var ev in result.Events)
        {
            w.WriteArrayHeader(6);
            w.Write(ev.TimeS); w.Write(ev.Board); w.Write(KindName(ev.Kind)); w.Write(ev.X); w.Write(ev.Y); w.Write(ev.Detail);
        }
        w.Write("incidents");
        w.WriteArrayHeader(result.Incidents.Count);
        foreach (var i in result.Incidents)
        {
            w.WriteArrayHeader(9);
            w.Write(i.TimeS); w.Write(i.X); w.Write(i.Y); w.Write(i.KeepClear); w.Write(i.RightOfWay); w.Write(i.Rule);
            w.Write(i.Penalty); w.Write(i.Avoidable); w.Write(i.Detail);
        }
        w.Write("results");
        w.WriteArrayHeader(result.Boards.Count);
        foreach (var r in result.Boards)
        {
            w.WriteArrayHeader(8);
            w.Write(r.Board);
            if (r.Place is int p) w.Write(p); else w.WriteNil();
            w.Write(r.Finished);
            if (r.ElapsedS is double el) w.Write(el); else w.WriteNil();
            w.Write(r.DistanceM); w.Write(r.Tacks); w.Write(r.Gybes); w.Write(r.Falls);
        }
        WriteWind(ref w, race, rec);
        w.Flush();
        var bytes = payload.WrittenSpan.ToArray();

        var env = new ArrayBufferWriter<byte>(bytes.Length + 128);
        var ew = new MessagePackWriter(env);
        ew.WriteMapHeader(4);
        ew.Write("format"); ew.Write(Format);
        ew.Write("version"); ew.Write(Version);
        ew.Write("payload"); ew.Write(bytes);
        ew.Write("sha256"); ew.Write(SHA256.HashData(bytes));
        ew.Flush();
        return env.WrittenSpan.ToArray();
    }

    /// <summary>The replay's name of an event kind (docs/replay.md).</summary>
    public static string KindName(RaceEventKind k) => k switch
    {
        RaceEventKind.Started => "start", RaceEventKind.Ocs => "ocs", RaceEventKind.Cleared => "cleared", RaceEventKind.Rounded => "rounded",
        RaceEventKind.WrongSide => "wrong_side", RaceEventKind.Tack => "tack", RaceEventKind.Gybe => "gybe", RaceEventKind.Fall => "fall",
        RaceEventKind.Finished => "finish", RaceEventKind.NotFinished => "not_finished", RaceEventKind.GiveWay => "give_way",
        RaceEventKind.Contact => "contact", RaceEventKind.PenaltyServed => "penalty_taken",
        _ => throw new ArgumentOutOfRangeException(nameof(k), k, "an event kind with no replay name"),
    };

    /// <summary>The value of column c (<see cref="ColumnNames"/>) in a recorded sample.</summary>
    public static float Pick(in BoardSample s, int c) => c switch
    {
        0 => s.X, 1 => s.Y, 2 => s.HeadingDeg, 3 => s.SpeedMs, 4 => s.LeewayDeg, 5 => s.AttackDeg, 6 => s.HeelUse,
        7 => s.TwaDeg, 8 => s.AwaDeg, 9 => s.TwsMs, 10 => s.TwdDeg, 11 => s.Sheet, _ => s.ReserveShare,
    };

    static void WriteCourse(ref MessagePackWriter w, Course c)
    {
        w.Write("course");
        w.WriteMapHeader(4);
        w.Write("kind"); w.Write(c.Kind);
        w.Write("axis_deg"); w.Write(c.AxisDeg);
        w.Write("start");
        w.WriteArrayHeader(6);
        w.Write(c.Start.A.X); w.Write(c.Start.A.Y); w.Write(c.Start.B.X); w.Write(c.Start.B.Y); w.Write(c.Start.Normal.X); w.Write(c.Start.Normal.Y);
        w.Write("steps");
        w.WriteArrayHeader(c.Steps.Count);
        foreach (var st in c.Steps)
        {
            w.WriteArrayHeader(4);
            w.Write(st.Kind switch { StepKind.Mark => "mark", StepKind.Gate => "gate", _ => "finish" });
            w.Write(st.Name);
            w.Write(st.Side == Rounding.Port ? "port" : "starboard");
            var pts = st.Kind switch
            {
                StepKind.Mark => new[] { st.Mark!.Position.X, st.Mark.Position.Y },
                StepKind.Gate => new[] { st.Mark!.Position.X, st.Mark.Position.Y, st.Second!.Position.X, st.Second.Position.Y },
                _ => new[] { st.Line!.A.X, st.Line.A.Y, st.Line.B.X, st.Line.B.Y },
            };
            w.WriteArrayHeader(pts.Length);
            foreach (var v in pts) w.Write(v);
        }
    }

    static void WriteWind(ref MessagePackWriter w, Race race, Recorder rec)
    {
        // The box around the course and every recorded position, with a margin.
        double x0 = double.MaxValue, y0 = double.MaxValue, x1 = double.MinValue, y1 = double.MinValue;
        void Take(Vec2 p) { x0 = Math.Min(x0, p.X); y0 = Math.Min(y0, p.Y); x1 = Math.Max(x1, p.X); y1 = Math.Max(y1, p.Y); }
        Take(race.Course.Start.A); Take(race.Course.Start.B);
        foreach (var m in race.Course.Marks) Take(m.Position);
        foreach (var st in race.Course.Steps) if (st.Line is { } l) { Take(l.A); Take(l.B); }
        for (int k = 0; k < rec.Frames; k++) foreach (var s in rec.Frame(k)) Take(new Vec2(s.X, s.Y));
        double span = Math.Max(x1 - x0, y1 - y0) * 1.1 + 100;
        double cx = 0.5 * (x0 + x1), cy = 0.5 * (y0 + y1);
        double cell = span / WindCells;
        double gx = cx - span / 2, gy = cy - span / 2;
        double t0 = rec.StartS, t1 = rec.TimeOf(Math.Max(0, rec.Frames - 1));
        int frames = (int)Math.Floor((t1 - t0) / WindIntervalS) + 1;
        var sp = new byte[frames * WindCells * WindCells * 4];
        var dir = new byte[sp.Length];
        int idx = 0;
        for (int f = 0; f < frames; f++)
        {
            double t = t0 + f * WindIntervalS;
            for (int j = 0; j < WindCells; j++)
                for (int i = 0; i < WindCells; i++, idx++)
                {
                    var ws = race.Wind.Sample(gx + (i + 0.5) * cell, gy + (j + 0.5) * cell, t);
                    BinaryPrimitives.WriteSingleLittleEndian(sp.AsSpan(idx * 4), (float)ws.SpeedMs);
                    BinaryPrimitives.WriteSingleLittleEndian(dir.AsSpan(idx * 4), (float)ws.FromDeg);
                }
        }
        w.Write("wind");
        w.WriteMapHeader(10);
        w.Write("x0_m"); w.Write(gx); w.Write("y0_m"); w.Write(gy); w.Write("cell_m"); w.Write(cell);
        w.Write("nx"); w.Write(WindCells); w.Write("ny"); w.Write(WindCells);
        w.Write("start_s"); w.Write(t0); w.Write("interval_s"); w.Write(WindIntervalS); w.Write("frames"); w.Write(frames);
        w.Write("speed_ms"); w.Write(sp); w.Write("from_deg"); w.Write(dir);
    }

    /// <summary>Reads and checks a replay; <paramref name="name"/> is used in error messages.</summary>
    public static ReplayData Read(byte[] bytes, string name)
    {
        try
        {
            var r = new MessagePackReader(bytes);
            if (r.NextMessagePackType != MessagePackType.Map) throw new ReplayException($"{name}: not a CourseSim replay (no MessagePack map at the start)");
            int count = r.ReadMapHeader();
            string? format = null; int version = 0; byte[]? payload = null, hash = null;
            for (int i = 0; i < count; i++)
            {
                string key = r.ReadString() ?? "";
                switch (key)
                {
                    case "format": format = r.ReadString(); break;
                    case "version": long v = r.ReadInt64(); version = v is >= 0 and <= 1000 ? (int)v : -1; break;
                    case "payload": payload = Bytes(ref r); break;
                    case "sha256": hash = Bytes(ref r); break;
                    default: r.Skip(); break;
                }
            }
            if (format != Format) throw new ReplayException($"{name}: not a CourseSim replay (format '{format}', expected '{Format}')");
            if (version != Version) throw new ReplayException($"{name}: replay version {version} is not supported (this build reads version {Version})");
            if (payload is null || hash is null) throw new ReplayException($"{name}: the replay has no payload or checksum");
            if (!SHA256.HashData(payload).AsSpan().SequenceEqual(hash)) throw new ReplayException($"{name}: checksum mismatch: the replay is corrupt or was changed");
            return ReadPayload(payload, version, name);
        }
        catch (MessagePackSerializationException e) { throw new ReplayException($"{name}: truncated or malformed replay ({e.Message})"); }
        catch (EndOfStreamException) { throw new ReplayException($"{name}: truncated replay"); }
        catch (InvalidOperationException e) { throw new ReplayException($"{name}: malformed replay ({e.Message})"); }
        catch (OverflowException) { throw new ReplayException($"{name}: malformed replay (a number is out of range for its field)"); }
        catch (ArgumentException) { throw new ReplayException($"{name}: malformed replay (a length or count is larger than the file)"); }
    }

    static byte[] Bytes(ref MessagePackReader r) => r.ReadBytes() is { } seq ? seq.ToArray() : [];

    static float[] Floats(byte[] blob)
    {
        var f = new float[blob.Length / 4];
        for (int i = 0; i < f.Length; i++) f[i] = BinaryPrimitives.ReadSingleLittleEndian(blob.AsSpan(i * 4));
        return f;
    }

    static ReplayData ReadPayload(byte[] payload, int version, string name)
    {
        var r = new MessagePackReader(payload);
        int count = r.ReadMapHeader();
        string engine = "", scenario = "", venue = "", start = "", kind = "";
        double lat = 0, lon = 0, hz = 0, interval = 0, startS = 0, axis = 0;
        ulong seed = 0; int frames = 0;
        var boards = new List<ReplayBoard>(); var steps = new List<ReplayStep>(); var cols = new Dictionary<string, float[]>();
        var events = new List<ReplayEvent>(); var results = new List<ReplayResult>(); var incidents = new List<ReplayIncident>();
        double[] startLine = []; byte[] flags = [], next = [];
        ReplayWind? wind = null;
        for (int i = 0; i < count; i++)
        {
            string key = r.ReadString() ?? "";
            switch (key)
            {
                case "engine": engine = r.ReadString() ?? ""; break;
                case "scenario": scenario = r.ReadString() ?? ""; break;
                case "venue": venue = r.ReadString() ?? ""; break;
                case "origin_lat_deg": lat = r.ReadDouble(); break;
                case "origin_lon_deg": lon = r.ReadDouble(); break;
                case "seed": seed = r.ReadUInt64(); break;
                case "start_time_utc": start = r.ReadString() ?? ""; break;
                case "step_hz": hz = r.ReadDouble(); break;
                case "interval_s": interval = r.ReadDouble(); break;
                case "start_s": startS = r.ReadDouble(); break;
                case "frames": frames = ReplayLimits.Count(r.ReadInt64(), "frames", name); break;
                case "boards":
                    for (int n = r.ReadArrayHeader(), b = 0; b < n; b++)
                    {
                        string bn = "", be = ""; double sa = 0, rk = 0, sk = 0;
                        for (int m = r.ReadMapHeader(), k = 0; k < m; k++)
                            switch (r.ReadString())
                            {
                                case "name": bn = r.ReadString() ?? ""; break;
                                case "equipment": be = r.ReadString() ?? ""; break;
                                case "sail_m2": sa = r.ReadDouble(); break;
                                case "rider_kg": rk = r.ReadDouble(); break;
                                case "skill": sk = r.ReadDouble(); break;
                                default: r.Skip(); break;
                            }
                        boards.Add(new ReplayBoard(bn, be, sa, rk, sk));
                    }
                    break;
                case "course":
                    for (int m = r.ReadMapHeader(), k = 0; k < m; k++)
                        switch (r.ReadString())
                        {
                            case "kind": kind = r.ReadString() ?? ""; break;
                            case "axis_deg": axis = r.ReadDouble(); break;
                            case "start": startLine = new double[r.ReadArrayHeader()]; for (int q = 0; q < startLine.Length; q++) startLine[q] = r.ReadDouble(); break;
                            case "steps":
                                for (int sn = r.ReadArrayHeader(), q = 0; q < sn; q++)
                                {
                                    r.ReadArrayHeader();
                                    string sk = r.ReadString() ?? "", nm = r.ReadString() ?? "", rd = r.ReadString() ?? "";
                                    var pts = new double[r.ReadArrayHeader()];
                                    for (int z = 0; z < pts.Length; z++) pts[z] = r.ReadDouble();
                                    steps.Add(new ReplayStep(sk, nm, rd, pts));
                                }
                                break;
                            default: r.Skip(); break;
                        }
                    break;
                case "columns":
                    for (int m = r.ReadMapHeader(), k = 0; k < m; k++) { string cn = r.ReadString() ?? ""; cols[cn] = Floats(Bytes(ref r)); }
                    break;
                case "flags": flags = Bytes(ref r); break;
                case "next_step": next = Bytes(ref r); break;
                case "events":
                    for (int n = r.ReadArrayHeader(), q = 0; q < n; q++)
                    {
                        r.ReadArrayHeader();
                        events.Add(new ReplayEvent(r.ReadDouble(), r.ReadInt32(), r.ReadString() ?? "", r.ReadDouble(), r.ReadDouble(), r.ReadString() ?? ""));
                    }
                    break;
                case "incidents":
                    for (int n = r.ReadArrayHeader(), q = 0; q < n; q++)
                    {
                        r.ReadArrayHeader();
                        incidents.Add(new ReplayIncident(r.ReadDouble(), r.ReadDouble(), r.ReadDouble(), r.ReadInt32(), r.ReadInt32(), r.ReadString() ?? "",
                            r.ReadBoolean(), r.ReadBoolean(), r.ReadString() ?? ""));
                    }
                    break;
                case "results":
                    for (int n = r.ReadArrayHeader(), q = 0; q < n; q++)
                    {
                        r.ReadArrayHeader();
                        int bi = r.ReadInt32();
                        int? place = r.TryReadNil() ? null : r.ReadInt32();
                        bool fin = r.ReadBoolean();
                        double? el = r.TryReadNil() ? null : r.ReadDouble();
                        results.Add(new ReplayResult(bi, place, fin, el, r.ReadDouble(), r.ReadInt32(), r.ReadInt32(), r.ReadInt32()));
                    }
                    break;
                case "wind":
                {
                    double x0 = 0, y0 = 0, cell = 0, ws = 0, wi = 0; int nx = 0, ny = 0, wf = 0; float[] sp = [], dir = [];
                    for (int m = r.ReadMapHeader(), k = 0; k < m; k++)
                        switch (r.ReadString())
                        {
                            case "x0_m": x0 = r.ReadDouble(); break;
                            case "y0_m": y0 = r.ReadDouble(); break;
                            case "cell_m": cell = r.ReadDouble(); break;
                            case "nx": nx = r.ReadInt32(); break;
                            case "ny": ny = r.ReadInt32(); break;
                            case "start_s": ws = r.ReadDouble(); break;
                            case "interval_s": wi = r.ReadDouble(); break;
                            case "frames": wf = r.ReadInt32(); break;
                            case "speed_ms": sp = Floats(Bytes(ref r)); break;
                            case "from_deg": dir = Floats(Bytes(ref r)); break;
                            default: r.Skip(); break;
                        }
                    wind = new ReplayWind(x0, y0, cell, nx, ny, ws, wi, wf, sp, dir);
                    break;
                }
                default: r.Skip(); break;
            }
        }
        var data = new ReplayData
        {
            Version = version, Engine = engine, Scenario = scenario, Venue = venue, OriginLatDeg = lat, OriginLonDeg = lon, Seed = seed,
            StartTimeUtc = start, StepHz = hz, IntervalS = interval, StartS = startS, Frames = frames, Boards = boards, CourseKind = kind,
            CourseAxisDeg = axis, StartLine = startLine, Steps = steps, Columns = cols, Flags = flags, NextStep = next, Events = events, Incidents = incidents,
            Results = results, Wind = wind,
        };
        ReplayLimits.Check(data, name);
        return data;
    }
}
