namespace CourseSim.Engine;

/// <summary>What is recorded of one board at one instant (single precision: centimetres over tens of kilometres).</summary>
public struct BoardSample
{
    public float X, Y, HeadingDeg, SpeedMs, LeewayDeg, AttackDeg, HeelUse, TwaDeg, AwaDeg, TwsMs, TwdDeg, Sheet, ReserveShare;
    /// <summary>Bits: 1 planing, 2 pumping, 4 tacking, 8 gybing, 16 fallen, 32 finished, 64 OCS/returning.</summary>
    public byte Flags;
    public byte NextStep;
}

/// <summary>
/// Samples of every board at a fixed interval (the replay's frames), held in one array of structs sized up front for the
/// expected race (it grows, by doubling, only if the race runs past that): frame k is at <see cref="StartS"/> +
/// k x <see cref="IntervalS"/>, board b at index k x boards + b.
/// </summary>
public sealed class Recorder
{
    BoardSample[] _data;
    public int Boards { get; }
    public int Frames { get; private set; }
    public double IntervalS { get; }
    public double StartS { get; }

    public Recorder(int boards, double intervalS, double startS, int framesExpected = 256)
    {
        Boards = boards; IntervalS = intervalS; StartS = startS;
        _data = new BoardSample[Math.Max(1, boards) * Math.Max(16, framesExpected)];
    }

    /// <summary>A deep copy (for a checkpoint).</summary>
    public Recorder Copy()
    {
        var r = new Recorder(Boards, IntervalS, StartS, 16) { Frames = Frames };
        r._data = (BoardSample[])_data.Clone();
        return r;
    }

    /// <summary>The recorded samples as bytes (for a state hash).</summary>
    public ReadOnlySpan<byte> Bytes => System.Runtime.InteropServices.MemoryMarshal.AsBytes(new ReadOnlySpan<BoardSample>(_data, 0, Frames * Boards));

    public static int BytesPerSample => System.Runtime.CompilerServices.Unsafe.SizeOf<BoardSample>();
    public long MemoryBytes => (long)_data.Length * BytesPerSample;

    /// <summary>Starts a new frame and returns its row to fill.</summary>
    public Span<BoardSample> NewFrame()
    {
        int need = (Frames + 1) * Boards;
        if (need > _data.Length) Array.Resize(ref _data, Math.Max(need, _data.Length * 2));
        var row = new Span<BoardSample>(_data, Frames * Boards, Boards);
        Frames++;
        return row;
    }

    public ReadOnlySpan<BoardSample> Frame(int k) => new(_data, k * Boards, Boards);
    public ref readonly BoardSample At(int frame, int board) => ref _data[frame * Boards + board];
    public double TimeOf(int frame) => StartS + frame * IntervalS;
}
