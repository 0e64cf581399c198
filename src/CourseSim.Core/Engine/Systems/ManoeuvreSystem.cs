using CourseSim.Units;

namespace CourseSim.Engine.Systems;

/// <summary>
/// Manoeuvres. A heading change that takes the bow through the wind is a tack, through dead downwind a gybe; either
/// starts here when the helm asks for a heading on the other tack. Tack: head up with the sail drawing (phase 0) until
/// the apparent wind is within <see cref="Tuning.TackCrossStartDeg"/> of the bow, step round the mast with no drive while
/// the board swings through the wind (1), bear away and sheet in on the new tack (2). Gybe: carve with the sail drawing
/// (0) until the wind crosses the stern, flip the sail with no drive (1), sheet in on the new gybe (2); a gybe can fail
/// into a fall. Falls also come from being overpowered: a hazard per second that grows with the heeling moment beyond
/// the rider's limit. The time and distance a manoeuvre costs come out of the dynamics: no fixed penalty is applied.
/// </summary>
public sealed class ManoeuvreSystem : RaceSystem
{
    public override string Name => "manoeuvres";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Pose, Motion, SensedWind, Trim, Intent; grid (nearest board)";
    public override string Writes => "ManoeuvreState, RaceStatus counters, Pose/Motion after a water start, Trim.Sheet, Wake, events";

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        for (int i = 0; i < blk.Count; i++)
            One(c, blk.Id[i].Value, ref blk.Pose[i], ref blk.Motion[i], in blk.Wind[i], ref blk.Trim[i], in blk.Intent[i], ref blk.Manoeuvre[i], ref blk.Status[i], ref blk.Wake[i]);
    }

    static void One(RaceContext c, int b, ref Pose pose, ref Motion mo, in SensedWind sw, ref Trim trim, in Intent intent, ref ManoeuvreState m, ref RaceStatus st, ref Wake wake)
    {
        var f = c.Fleet;
        double skill = f.Skill[b], dt = c.Dt;
        bool falls = c.Settings.Falls;
        double twa = Sailing.SignedAngle(sw.TrueFromDeg, pose.Heading);
        double track = pose.Heading - FastMath.Sign(twa) * mo.Leeway;
        var rng = f.Stream(c.FallRng, b);
        switch (m.Kind)
        {
            case Manoeuvre.None:
                {
                    // Overpowered: the hazard grows with the moment held beyond what the rider can take for a moment
                    // (Tuning.OverpowerFallFrom) and with lack of skill (no falls in the first seconds, while the fleet gets going).
                    double over = trim.HeelUse - Tuning.OverpowerFallFrom;
                    if (over > 0 && falls && c.Time > -c.Settings.CountdownS + 5)
                    {
                        double hazard = Tuning.OverpowerHazardPerS * over * (1 - 0.8 * skill);
                        if (rng.Uniform((ulong)c.StepIndex * 2) < hazard * dt) { Fall(c, ref m, ref st, b, pose, mo.Speed, "overpowered"); break; }
                    }
                    double wantTwa = Sailing.SignedAngle(sw.TrueFromDeg, intent.Heading);
                    if (FastMath.Sign(wantTwa) != FastMath.Sign(twa) && twa != 0 && wantTwa != 0)
                    {
                        // twa - turn passes 0 (a tack) or pi (a gybe) on the shortest way round.
                        bool throughWind = Math.Abs(twa) + Math.Abs(wantTwa) < 2 * Math.PI - Math.Abs(twa) - Math.Abs(wantTwa);
                        m.Kind = throughWind ? Manoeuvre.Tack : Manoeuvre.Gybe;
                        wake.TurnStartS = c.Time; wake.TurnStartNearestM = c.Grid.NearestM[b];
                        m.Phase = 0; m.Timer = 0; m.ExitHeading = intent.Heading;
                        m.TurnSign = throughWind ? FastMath.Sign(twa) : -FastMath.Sign(twa);
                    }
                    break;
                }
            case Manoeuvre.Tack:
                m.Timer += dt;
                if (m.Phase == 0 && Math.Abs(trim.ApparentAngleRad) < Unit.DegToRad(Tuning.TackCrossStartDeg)) { m.Phase = 1; m.Timer = 0; }
                else if (m.Phase == 1 && FastMath.Sign(twa) == -FastMath.Sign(m.TurnSign) && Math.Abs(twa) >= Unit.DegToRad(Tuning.TackCrossStartDeg))
                {
                    m.Phase = 2; m.Timer = 0; st.Tacks++;
                    c.AddEvent(b, RaceEventKind.Tack, pose);
                }
                else if (m.Phase == 2 && Math.Abs(Unit.WrapRadPi(m.ExitHeading - track)) < Unit.DegToRad(3)) { m.Kind = Manoeuvre.None; m.Phase = 0; }
                // A tack the rider cannot finish (stalled head to wind for long) ends in a fall.
                if (m.Kind == Manoeuvre.Tack && m.Timer > 20) Fall(c, ref m, ref st, b, pose, mo.Speed, "stalled in a tack");
                break;
            case Manoeuvre.Gybe:
                m.Timer += dt;
                if (m.Phase == 0 && FastMath.Sign(twa) == FastMath.Sign(m.TurnSign))
                {
                    m.Phase = 1; m.Timer = 0; st.Gybes++;
                    c.AddEvent(b, RaceEventKind.Gybe, pose);
                    double fail = trim.Planing ? Tuning.GybeFailNovicePlaning : Tuning.GybeFailNoviceDisplacement;
                    fail *= (1 - skill) * (1 - skill);
                    if (falls && rng.Uniform((ulong)c.StepIndex * 2 + 1) < fail) { Fall(c, ref m, ref st, b, pose, mo.Speed, "failed gybe"); break; }
                }
                else if (m.Phase == 1 && m.Timer >= Tuning.Lerp(Tuning.GybeFlipExpertS, Tuning.GybeFlipNoviceS, skill)) { m.Phase = 2; m.Timer = 0; }
                else if (m.Phase == 2 && Math.Abs(Unit.WrapRadPi(m.ExitHeading - track)) < Unit.DegToRad(3)) { m.Kind = Manoeuvre.None; m.Phase = 0; }
                if (m.Kind == Manoeuvre.Gybe && m.Timer > 30) { m.Kind = Manoeuvre.None; m.Phase = 0; }
                break;
            case Manoeuvre.Fallen:
                m.Timer += dt;
                if (m.Timer >= Tuning.Lerp(Tuning.WaterStartExpertS, Tuning.WaterStartNoviceS, skill))
                {
                    // Water-started on a beam reach on the tack the board lies on.
                    m.Kind = Manoeuvre.None; m.Phase = 0;
                    double side = twa >= 0 ? 1 : -1;
                    pose.Heading = Unit.WrapRadPi(Unit.DegToRad(sw.TrueFromDeg) - side * Math.PI / 2);
                    double tr = pose.Heading - side * mo.Leeway;
                    (mo.TrackSin, mo.TrackCos) = Math.SinCos(tr);
                    trim.Sheet = 0;
                }
                break;
        }
    }

    static void Fall(RaceContext c, ref ManoeuvreState m, ref RaceStatus st, int board, in Pose p, double speed, string why)
    {
        m.Kind = Manoeuvre.Fallen; m.Phase = 0; m.Timer = 0;
        st.Falls++;
        c.AddEvent(board, RaceEventKind.Fall, p, "{0} at {2:F1} kn board speed", why, null, Unit.MsToKnots(speed)); // the text is made when read
    }
}
