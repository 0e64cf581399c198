using CourseSim.Units;
using CourseSim.Wind;

namespace CourseSim.Engine;

public sealed partial class Race
{
    /// <summary>Riders pump while slower than this share of their rig's steady speed at the angle sailed (model value).</summary>
    public const double PumpBelowShare = 0.95;

    /// <summary>Signed true wind angle (rad): positive when the wind comes over the starboard side (starboard tack).</summary>
    /// <summary>Least angle of the bow to the true wind outside a tack, deg (common practice: a board stalls closer than about 30 deg).</summary>
    public const double MinPointDeg = 30;
    /// <summary>Speed below which <see cref="MinPointDeg"/> applies, m/s (model value: a board barely under way).</summary>
    public const double MinPointBelowMs = 2;

    public static double SignedAngle(double fromDeg, double headingRad) => Unit.WrapRadPi(Unit.DegToRad(fromDeg) - headingRad);

    /// <summary>
    /// System 1, sense wind: the wind field at each rig with the shadows of every other sail, and the rider's reading of
    /// it, which lags the true wind by <see cref="Tuning.PerceptionLagS"/>. The wind is sampled at
    /// race.wind_hz (default 5 Hz), each board in turn (staggered over the steps, so every step costs the same): in
    /// 0.2 s a board moves a few metres and the field's patterns a metre or two, less than the gust tile resolves, so
    /// sampling faster changes nothing but the cost. Shadows are rebuilt at the same rate from the boards' positions
    /// and apparent winds (a uniform grid, no all-pairs).
    /// </summary>
    void SenseWind()
    {
        int phase = BuildShadows();
        double k = Math.Min(1, _senseEvery * Dt / Tuning.PerceptionLagS);
        bool first = StepIndex == 0;
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var sw = chunk.Span<SensedWind>();
            for (int i = 0; i < ids.Length; i++) SenseOne(ids[i].Value, phase, first, k, in pose[i], ref sw[i]);
        }
    }

    /// <summary>Advances the sensing phase; on phase 0 rebuilds the shadow hash from every board's position and apparent wind.</summary>
    int BuildShadows()
    {
        int every = _senseEvery;
        int phase = _sensePhase;
        _sensePhase = phase + 1 == every ? 0 : phase + 1;
        if (phase == 0)
        {
            foreach (var chunk in _all)
            {
                var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var trim = chunk.Span<Trim>(); var sw = chunk.Span<SensedWind>();
                var st = chunk.Span<RaceStatus>();
                for (int i = 0; i < chunk.Count; i++)
                {
                    var rig = _rig[ids[i].Value];
                    double appFrom = Unit.WrapDeg360(Unit.RadToDeg(pose[i].Heading + trim[i].ApparentAngleRad));
                    // A finished board sails off the course and leaves no wake.
                    double wind = st[i].State == RaceState.Finished ? 0 : sw[i].TrueSpeed;
                    _sources[ids[i].Value] = new ShadowSource(pose[i].X, pose[i].Y, appFrom, rig.MastHeightM, wind, trim[i].AppDownX, trim[i].AppDownY);
                }
            }
            Shadow.Build(_sources);
        }
        return phase;
    }

    void SenseOne(int b, int phase, bool first, double k, in Pose pose, ref SensedWind sw)
    {
        if (!first && _senseSlot[b] != phase) return;
        var w = Wind.Sample(pose.X, pose.Y, Time);
        w = Shadow.Apply(w, pose.X, pose.Y, b);
        sw.TrueSpeed = w.SpeedMs; sw.TrueFromDeg = w.FromDeg;
        sw.FromRad = Unit.DegToRad(w.FromDeg); (sw.FromSin, sw.FromCos) = FastMath.SinCos(sw.FromRad);
        sw.RigSpeed = w.SpeedMs * _rig[b].GradientFactor(w.SpeedMs);
        if (first) { sw.PerceivedSpeed = w.SpeedMs; sw.PerceivedFromDeg = w.FromDeg; }
        else
        {
            sw.PerceivedSpeed += k * (w.SpeedMs - sw.PerceivedSpeed);
            sw.PerceivedFromDeg = Unit.WrapDeg360(sw.PerceivedFromDeg + k * Unit.WrapDeg180(w.FromDeg - sw.PerceivedFromDeg));
        }
    }


    /// <summary>
    /// Systems 3 and 4, trim and forces. The rider sheets towards the power the tactic wants, capped by what the heeling
    /// limit allows in the apparent wind now; the sheet follows with the rider's reaction lag, so a gust briefly loads the
    /// rider past the limit (and may topple them). Forces: sail (rig tables), fin (side force and drag, ventilation at
    /// speed makes the rider ease), hull (resistance), pumping below planing while the reserve lasts, and the rider's
    /// drag in the water after a fall.
    /// </summary>
    void TrimAndForces()
    {
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var mo = chunk.Span<Motion>(); var sw = chunk.Span<SensedWind>();
            var trim = chunk.Span<Trim>(); var rider = chunk.Span<RiderState>(); var intent = chunk.Span<Intent>(); var man = chunk.Span<ManoeuvreState>();
            for (int i = 0; i < ids.Length; i++)
                TrimOne(ids[i].Value, in pose[i], ref mo[i], in sw[i], ref trim[i], ref rider[i], in intent[i], in man[i]);
        }
    }

    void TrimOne(int b, in Pose pose, ref Motion mo, in SensedWind sw, ref Trim t, ref RiderState rider, in Intent intent, in ManoeuvreState man)
    {
        var rig = _rig[b];
        double v = mo.Speed;
        // The track (heading less leeway) and its sine and cosine, as the integrator left them.
        double track = pose.Heading - Math.Sign(t.TrueAngleRad) * mo.Leeway;
        // Apparent wind from the true wind at the rig and the board's velocity along its track.
        double st0 = mo.TrackSin, ct0 = mo.TrackCos;
        double ax = -sw.RigSpeed * sw.FromSin - v * st0, ay = -sw.RigSpeed * sw.FromCos - v * ct0;
        double aws = Math.Sqrt(ax * ax + ay * ay);
        double appFrom = FastMath.Atan2(-ax, -ay); // to 1e-5 rad: the rig tables are in 1-degree steps
        double beta = Unit.WrapRadPi(appFrom - track);
        t.TrueAngleRad = Unit.WrapRadPi(sw.FromRad - pose.Heading);
        t.ApparentSpeed = aws;
        if (aws > 1e-9) { t.AppDownX = ax / aws; t.AppDownY = ay / aws; } else { t.AppDownX = double.NaN; t.AppDownY = double.NaN; }
        t.ApparentAngleRad = Unit.WrapRadPi(appFrom - pose.Heading);
        double absBeta = Math.Abs(beta);
        // Sheet: what the tactic wants, capped by the heel limit, followed with the rider's reaction lag (so a
        // gust briefly loads the rider past the limit); no drive while crossing, flipping or swimming.
        bool noDrive = man.Kind == Manoeuvre.Fallen || (man.Kind == Manoeuvre.Tack && man.Phase == 1) || (man.Kind == Manoeuvre.Gybe && man.Phase == 1);
        if (noDrive) t.Sheet = 0;
        var sail = rig.Trim(aws, absBeta, noDrive ? 0 : intent.Power, ref t.Sheet, noDrive ? 1 : _sheetGain[b]);
        if (v >= Equilibrium.BoardPhysics.SpinOutMinSpeed && Math.Abs(sail.Side) > rig.FinCapacity(v))
        {
            // The fin would ventilate: the rider eases at once (a reflex) until it grips.
            t.Sheet = rig.FinSheetCap(aws, absBeta, v, t.Sheet);
            sail = rig.Sail(aws, absBeta, t.Sheet);
        }
        double drive = sail.Drive, side = sail.Side, heel = sail.HeelUse;
        if (noDrive) { drive = Math.Min(drive, 0); side = 0; heel = 0; }
        double finDrag = rig.Fin(side, v, out double leeway, out _);
        var hullModel = rig.Hull;
        double hullDrag = hullModel.ResistanceAt(v, out double lift);
        // Stepping round the mast puts the rider's weight on the nose: the board drops off the plane.
        if (man.Kind == Manoeuvre.Tack && man.Phase == 1) { hullDrag = Math.Max(hullDrag, hullModel.UnplanedResistance(v)); lift = 0; }
        t.BetaRad = absBeta; t.HeelUse = heel;
        // Heel use against the limit with the sheet the rider holds (lagging a gust): above 1 the rider is overpowered.
        t.Drive = drive; t.Side = side; t.FinDrag = finDrag; t.HullDrag = hullDrag;
        t.Planing = lift >= 0.5;
        mo.Leeway = leeway;
        var rm = rig.Rider;
        // Out of breath at the floor, the rider rests until the reserve is back to RestUntil (hysteresis).
        if (rider.ReserveJ <= Tuning.ReserveFloor * rm.ReserveJ) rider.Resting = true;
        else if (rider.ReserveJ >= Tuning.RestUntil * rm.ReserveJ) rider.Resting = false;
        // Pumping: a racer pumps while below the speed their rig should make at this angle (to get onto the plane,
        // or back onto it after a manoeuvre or a lull), driving, not manoeuvring, while the reserve lasts.
        bool pump = _pumping && !noDrive && man.Kind == Manoeuvre.None && intent.Power >= 0.99
                    && !rider.Resting && aws > 2
                    && v < PumpBelowShare * intent.TargetSpeed;
        double power = pump ? rm.PowerFor(Equilibrium.VelocityPrediction.PumpBurstS) : 0;
        rider.PumpPowerW = power;
        if (power > 0) rider.ReserveJ = rm.StepReserve(rider.ReserveJ, power, Dt);
        else if (rider.ReserveJ < rm.ReserveJ) rider.ReserveJ = rm.ReserveJ - (rm.ReserveJ - rider.ReserveJ) * _restDecay[b];
        t.Pumping = pump;
        t.PumpThrust = pump ? rm.PumpThrust(power, v) : 0;
    }


    /// <summary>
    /// System 5, integrate: surge from the net force on the whole mass (semi-implicit Euler); sway as the fin's leeway
    /// (the side force is balanced within a step at these speeds); yaw rate-limited towards the wanted heading, at the
    /// larger of the rig-steering rate and the carving rate V/R.
    /// </summary>
    void Integrate()
    {
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var mo = chunk.Span<Motion>();
            var trim = chunk.Span<Trim>(); var intent = chunk.Span<Intent>(); var man = chunk.Span<ManoeuvreState>();
            for (int i = 0; i < ids.Length; i++) IntegrateOne(ids[i].Value, ref pose[i], ref mo[i], in trim[i], in intent[i], in man[i]);
        }
    }

    void IntegrateOne(int b, ref Pose p, ref Motion m, in Trim t, in Intent intent, in ManoeuvreState man)
    {
        double v = m.Speed;
        double water = man.Kind == Manoeuvre.Fallen ? 0.5 * 1025 * v * v * Tuning.InWaterDragAreaM2 : 0;
        double net = t.Drive + t.PumpThrust - t.FinDrag - t.HullDrag - water;
        v = Math.Max(0, v + net * _dtOverMass[b]);
        m.Speed = v;
        // Yaw.
        double rate = YawRate(b, v, man);
        double want = man.Kind == Manoeuvre.None ? intent.Heading : WantedHeading(man, p.Heading);
        // The tactic's heading is the course to make good through the water: steer the track (heading less leeway) onto it.
        double side = Math.Sign(t.TrueAngleRad);
        double d = Unit.WrapRadPi(want - (p.Heading - side * m.Leeway));
        if (man.Kind is Manoeuvre.Tack or Manoeuvre.Gybe && man.Phase < 2) d = man.TurnSign * Math.PI; // keep turning the chosen way
        if (man.Kind == Manoeuvre.Fallen) d = 0;
        double turn = Math.Clamp(d, -rate * Dt, rate * Dt);
        if (man.Kind == Manoeuvre.None && v < MinPointBelowMs)
        {
            // Slow and out of a tack, a rider never lets the bow come closer to the wind than MinPointDeg (with the large
            // leeway of a slow board, holding the track would otherwise pinch it into irons and round onto the other tack).
            double minPoint = Unit.DegToRad(MinPointDeg), twa = t.TrueAngleRad;
            if (side > 0 && twa - turn < minPoint) turn = Math.Min(turn, Math.Max(0, twa - minPoint));
            else if (side < 0 && twa - turn > -minPoint) turn = Math.Max(turn, Math.Min(0, twa + minPoint));
        }
        m.YawRate = turn * _stepHz;
        p.Heading = Unit.WrapRadPi(p.Heading + turn);
        double track = p.Heading - side * m.Leeway;
        (m.TrackSin, m.TrackCos) = FastMath.SinCos(track);
        p.X += v * Dt * m.TrackSin;
        p.Y += v * Dt * m.TrackCos;
        if (Time >= 0) m.Distance += v * Dt;
    }


    double YawRate(int board, double speed, in ManoeuvreState man)
    {
        if (man.Kind == Manoeuvre.Tack && man.Phase == 1) return _crossYaw[board];
        return Math.Min(MaxYawRad, Math.Max(RigYawRad, speed * _invCarveRadius[board]));
    }

    static readonly double RigYawRad = Unit.DegToRad(Tuning.RigSteerDegPerS), MaxYawRad = Unit.DegToRad(Tuning.MaxYawDegPerS);

    static double WantedHeading(in ManoeuvreState man, double heading) => man.Phase >= 2 ? man.ExitHeading : heading;
}
