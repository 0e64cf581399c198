using CourseSim.Units;

namespace CourseSim.Equilibrium;

/// <summary>
/// The rig's own polar as the engine's force model gives it (docs/engine.md, "Targets"): sustained speed against true
/// wind speed (10 m) and angle, the best upwind and downwind VMG angles, and the get-planing branch (the speed from a
/// start off the plane at each angle, and the angles at which a board off the plane gets planing). Both branches come
/// from <see cref="PlaningBranches"/> on the rig tables' net force, the same recipe the velocity prediction uses on the
/// board model. Agents use it for targets and laylines, so their expectations match the dynamics they sail with.
/// </summary>
public sealed class RigPolar
{
    public const double TwsStepKn = 1, TwsMaxKn = 40;
    const int TwaSteps = 180; // 1 deg
    public RigDynamics Rig { get; }
    readonly float[] _speed;      // [tws, twa] sustained m/s (single precision: the table is read at every decision of every rider)
    readonly float[] _get;        // [tws, twa] get-planing m/s: from a start off the plane at that angle
    readonly double[] _upTwa, _downTwa, _upVmg, _downVmg; // per tws
    readonly double[] _getUpTwa, _getDownTwa; // per tws: the closest-hauled / deepest angle at which a board off the plane gets planing (NaN: none)
    readonly int _nt;

    readonly PlaningBranches _branches;
    readonly double[] _tws;
    readonly bool[][] _plan;           // per listed wind (built on demand): whether the planing branch exists at each angle
    readonly bool[] _ready;            // per listed wind: the row of the tables is built
    readonly Dictionary<int, double> _dropOffMemo = new();
    readonly object _build = new();
    // Tables other layers derive from this polar alone (the start's run-up curves), kept with it and dropped with it:
    // no process-wide table keyed by polar.
    readonly System.Collections.Concurrent.ConcurrentDictionary<Type, object> _derived = new();

    /// <summary>
    /// A table of type <typeparamref name="T"/> derived from this polar alone, made on first use by
    /// <paramref name="make"/> and kept with the polar (shared by every race that shares the polar: it must be
    /// thread-safe and its contents must depend on nothing but the polar).
    /// </summary>
    public T Derived<T>(Func<RigPolar, T> make) where T : class => (T)_derived.GetOrAdd(typeof(T), static (_, arg) => arg.make(arg.self), (make, self: this));

    /// <summary>Builds the rig tables of a set-up; the polar's rows are built on first use, one wind speed at a time
    /// (a race reads the few winds it meets). Share them through a <see cref="RigCache"/>.</summary>
    public static RigPolar Build(Equipment eq) => new(new RigDynamics(eq));

    public RigPolar(RigDynamics rig)
    {
        Rig = rig;
        _nt = (int)(TwsMaxKn / TwsStepKn) + 1;
        _speed = new float[_nt * (TwaSteps + 1)];
        _get = new float[_nt * (TwaSteps + 1)];
        _upTwa = new double[_nt]; _downTwa = new double[_nt]; _upVmg = new double[_nt]; _downVmg = new double[_nt];
        _getUpTwa = new double[_nt]; _getDownTwa = new double[_nt];
        double burst = rig.Physics.Rider.PowerFor(VelocityPrediction.PumpBurstS);
        _branches = new PlaningBranches((tws, twa, v) => rig.SteadyNetForce(tws * rig.GradientFactor(tws), twa, v),
            v => rig.Physics.Rider.PumpThrust(burst, v), rig.Hull.SpeedAtFroude(Hull.HullModel.DropOffFroude), 40);
        _tws = new double[_nt];
        for (int w = 0; w < _nt; w++) _tws[w] = Unit.KnotsToMs(w * TwsStepKn);
        _plan = new bool[_nt][];
        _ready = new bool[_nt];
    }

    /// <summary>Builds every row now (the polar command and tests that read the whole table).</summary>
    public RigPolar Complete()
    {
        Parallel.For(0, _nt, Ensure);
        return this;
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    void Ensure(int w)
    {
        if (!Volatile.Read(ref _ready[w])) BuildRow(w);
    }

    bool[] PlanRow(int w)
    {
        // Called under the build lock.
        if (_plan[w] is { } row) return row;
        row = new bool[TwaSteps + 1];
        for (int a = 0; a <= TwaSteps; a++) row[a] = _branches.Roots(_tws[w], Unit.DegToRad(a)).Plan is not null;
        return _plan[w] = row;
    }

    // The drop-off wind of a cell (PlaningBranches.DropOffWind over the same band) searched only inside the one listed
    // wind step where the branch appears, memoised per angle and step: searching it from scratch for every cell made
    // building a rig take seconds.
    double DropOff(int a, double twsMs, bool planHere)
    {
        var br = _branches;
        double twa = Unit.DegToRad(a), sd = PlaningBranches.GustShare * Math.Max(twsMs, 0.5);
        double lo = Math.Max(0.5, twsMs - 4 * sd), hi = planHere ? twsMs : twsMs + 4 * sd;
        if (br.Roots(lo, twa).Plan is not null) return lo;
        int g = 0;
        while (g < _nt && (_tws[g] <= lo || !PlanRow(g)[a]))
        {
            if (_tws[g] > hi) break;
            g++;
        }
        if (g >= _nt || _tws[g] > hi) return br.DropOffWind(twa, lo, hi);
        double from = Math.Max(lo, _tws[g - 1]);
        if (from > _tws[g - 1]) return br.DropOffWind(twa, from, _tws[g]);
        int key = a * 1000 + g;
        if (!_dropOffMemo.TryGetValue(key, out double d)) _dropOffMemo[key] = d = br.DropOffWind(twa, _tws[g - 1], _tws[g]);
        return d;
    }

    void BuildRow(int w)
    {
        lock (_build)
        {
            if (_ready[w]) return;
            var br = _branches;
            double tw = _tws[w];
            var plan = PlanRow(w);
            var get = new bool[TwaSteps + 1];
            // The rider can get planing in this wind if the get-planing branch planes at some reaching angle.
            bool canGet = false;
            for (int a = 0; a <= TwaSteps; a++)
            {
                get[a] = br.GetsPlaning(tw, Unit.DegToRad(a));
                canGet |= get[a];
            }
            double bestUp = 0, bestDown = 0; int upAt = 45, downAt = 150, getUp = -1, getDown = -1;
            for (int a = 0; a <= TwaSteps; a++)
            {
                var b = canGet ? br.At(tw, Unit.DegToRad(a), true, DropOff(a, tw, plan[a])) : br.At(tw, Unit.DegToRad(a), false);
                double v = b.Sustained;
                _speed[w * (TwaSteps + 1) + a] = (float)v;
                _get[w * (TwaSteps + 1) + a] = (float)b.GetPlaning;
                double vmg = v * Math.Cos(Unit.DegToRad(a));
                if (a >= 25 && a <= 90 && vmg > bestUp) { bestUp = vmg; upAt = a; }
                if (a >= 90 && a <= 178 && -vmg > bestDown) { bestDown = -vmg; downAt = a; }
                if (get[a] && a <= 90 && getUp < 0) getUp = a;
                if (get[a] && a >= 90) getDown = a;
            }
            _upTwa[w] = Unit.DegToRad(upAt); _downTwa[w] = Unit.DegToRad(downAt); _upVmg[w] = bestUp; _downVmg[w] = bestDown;
            _getUpTwa[w] = getUp < 0 ? double.NaN : Unit.DegToRad(getUp);
            _getDownTwa[w] = getDown < 0 ? double.NaN : Unit.DegToRad(getDown);
            Volatile.Write(ref _ready[w], true);
        }
    }

    static (int, double) Index(double x, double step, int n)
    {
        double q = Math.Clamp(x / step, 0, n - 1);
        int i = Math.Min((int)q, n - 2);
        return (i, q - i);
    }

    /// <summary>Sustained speed (m/s) at true wind speed (m/s, 10 m) and angle (rad; sign ignored): planing with
    /// hysteresis in a gusty wind (<see cref="PlaningBranches"/>).</summary>
    public double Speed(double twsMs, double twaRad) => Read(_speed, twsMs, twaRad);

    /// <summary>Speed (m/s) a board starting off the plane reaches at this wind and angle (planing only where pumping or
    /// the wind carries it over the hump at this very angle).</summary>
    public double GetPlaningSpeed(double twsMs, double twaRad) => Read(_get, twsMs, twaRad);

    /// <summary>
    /// Angle (rad, 0..pi) a rider off the plane heads to so as to get planing: downwind the deepest, upwind the closest-hauled
    /// angle at which the get-planing branch planes in this wind (nearest listed wind speed); NaN where the board does not
    /// get planing at any angle. Once planing the rider bears away (or heads up) to <see cref="BestTwa"/>.
    /// </summary>
    public double GetPlaningTwa(double twsMs, bool upwind)
    {
        int w = (int)Math.Clamp(Math.Round(Unit.MsToKnots(twsMs) / TwsStepKn), 0, _nt - 1);
        Ensure(w);
        return upwind ? _getUpTwa[w] : _getDownTwa[w];
    }

    double Read(float[] table, double twsMs, double twaRad)
    {
        var _speed = table;
        var (w, fw) = Index(Unit.MsToKnots(twsMs), TwsStepKn, _nt);
        Ensure(w); Ensure(w + 1);
        var (a, fa) = Index(Unit.RadToDeg(Math.Abs(Unit.WrapRadPi(twaRad))), 1, TwaSteps + 1);
        int r0 = w * (TwaSteps + 1), r1 = r0 + TwaSteps + 1;
        double s0 = _speed[r0 + a] + fa * (_speed[r0 + a + 1] - _speed[r0 + a]);
        double s1 = _speed[r1 + a] + fa * (_speed[r1 + a + 1] - _speed[r1 + a]);
        return s0 + fw * (s1 - s0);
    }

    double Lerp(double[] t, double twsMs)
    {
        var (w, fw) = Index(Unit.MsToKnots(twsMs), TwsStepKn, _nt);
        Ensure(w); Ensure(w + 1);
        return t[w] + fw * (t[w + 1] - t[w]);
    }

    /// <summary>Best VMG true wind angle (rad, 0..pi) upwind or downwind at this wind speed.</summary>
    public double BestTwa(double twsMs, bool upwind) => Lerp(upwind ? _upTwa : _downTwa, twsMs);
    /// <summary>Best VMG (m/s, positive) upwind or downwind.</summary>
    public double BestVmg(double twsMs, bool upwind) => Lerp(upwind ? _upVmg : _downVmg, twsMs);

    // The disk cache (RigTableStore). A row w is a pure function of the set-up and w: BuildRow reads only its own wind,
    // PlanRow(g) (a function of the set-up and g) and the drop-off memo, whose value for (angle, g) is the drop-off wind
    // searched between the listed winds g-1 and g whichever row asked first. So a row read back from disk, with its plan
    // rows and memo, leaves the polar in the very state building it would: same bits for every later read and build.
    internal const int RowLength = TwaSteps + 1;
    internal int RowCount => _nt;

    /// <summary>The rows built (or loaded) so far, one bit per listed wind.</summary>
    internal ulong ReadyRows
    {
        get
        {
            ulong m = 0;
            for (int w = 0; w < _nt; w++) if (Volatile.Read(ref _ready[w])) m |= 1UL << w;
            return m;
        }
    }

    /// <summary>A copy of every row built so far, the plan rows and the drop-off memo (taken under the build lock).</summary>
    internal RigTables ExportRows()
    {
        lock (_build)
        {
            var t = new RigTables();
            for (int w = 0; w < _nt; w++)
            {
                if (_plan[w] is { } plan) t.Plan.Add(new PlanRowData { W = w, Plan = (bool[])plan.Clone() });
                if (!_ready[w]) continue;
                t.Rows.Add(new PolarRowData
                {
                    W = w, Speed = _speed.AsSpan(w * RowLength, RowLength).ToArray(), Get = _get.AsSpan(w * RowLength, RowLength).ToArray(),
                    UpTwa = _upTwa[w], DownTwa = _downTwa[w], UpVmg = _upVmg[w], DownVmg = _downVmg[w], GetUpTwa = _getUpTwa[w], GetDownTwa = _getDownTwa[w],
                });
            }
            var keys = _dropOffMemo.Keys.Order().ToArray();
            t.DropOffKeys = keys;
            t.DropOffWinds = keys.Select(k => _dropOffMemo[k]).ToArray();
            return t;
        }
    }

    /// <summary>Takes in rows read from disk (already checked for shape by the store); rows built already are kept.
    /// Returns the rows taken, one bit per listed wind.</summary>
    internal ulong ImportRows(RigTables t)
    {
        ulong taken = 0;
        lock (_build)
        {
            foreach (var p in t.Plan) _plan[p.W] ??= (bool[])p.Plan.Clone();
            for (int i = 0; i < t.DropOffKeys.Length; i++) _dropOffMemo.TryAdd(t.DropOffKeys[i], t.DropOffWinds[i]);
            foreach (var r in t.Rows)
            {
                int w = r.W;
                if (_ready[w]) continue;
                r.Speed.CopyTo(_speed, w * RowLength);
                r.Get.CopyTo(_get, w * RowLength);
                _upTwa[w] = r.UpTwa; _downTwa[w] = r.DownTwa; _upVmg[w] = r.UpVmg; _downVmg[w] = r.DownVmg;
                _getUpTwa[w] = r.GetUpTwa; _getDownTwa[w] = r.GetDownTwa;
                Volatile.Write(ref _ready[w], true);
                taken |= 1UL << w;
            }
        }
        return taken;
    }
}
