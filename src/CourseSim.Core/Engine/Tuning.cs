namespace CourseSim.Engine;

/// <summary>
/// Rider and manoeuvre constants of the engine (docs/engine.md, "Manoeuvres"), with where each comes from. Skill is the
/// rider's 0..1 skill from the equipment file; (1 - skill) scales the slow and clumsy parts.
/// </summary>
public static class Tuning
{
    /// <summary>Steering rate available from raking the rig when the board is slow, deg/s (from memory: a board pivots through 90 deg in 4-5 s when luffing up with the rig).</summary>
    public const double RigSteerDegPerS = 20;
    /// <summary>Carving radius of a planing turn at skill 1 and 0, m (from memory: 5-10 m for a carve gybe at speed).</summary>
    public const double CarveRadiusExpertM = 6, CarveRadiusNoviceM = 12;
    /// <summary>Largest yaw rate, deg/s.</summary>
    public const double MaxYawDegPerS = 70;
    /// <summary>Time from the sail going slack to sheeting in on the new tack, while the rider steps round the mast, at skill 1
    /// and 0, s (from memory: about 1.5 s for a racer on a short board, 4 s for a club rider).</summary>
    public const double TackCrossExpertS = 1.5, TackCrossNoviceS = 4.0;
    /// <summary>Apparent angle below which the sail stops driving in a tack and the rider crosses, deg (common practice).</summary>
    public const double TackCrossStartDeg = 15;
    /// <summary>Time the sail is flipped and not drawing in a gybe at skill 1 and 0, s (from memory: 0.5-2 s).</summary>
    public const double GybeFlipExpertS = 0.6, GybeFlipNoviceS = 2.0;
    /// <summary>Chance a gybe ends in a fall at skill 0, planing and not (from memory; club riders miss many planing gybes).</summary>
    public const double GybeFailNovicePlaning = 0.45, GybeFailNoviceDisplacement = 0.15;
    /// <summary>Time in the water and water-starting after a fall at skill 1 and 0, s (from memory: 8-25 s).</summary>
    public const double WaterStartExpertS = 8, WaterStartNoviceS = 25;
    /// <summary>Drag area of a rider in the water holding the rig, m2 (model value: stops a board in a few metres).</summary>
    public const double InWaterDragAreaM2 = 0.6;
    /// <summary>Rider's reaction time constant for sheeting, s, at skill 1 and 0 (from memory: human reaction 0.2-0.5 s).</summary>
    public const double SheetLagExpertS = 0.2, SheetLagNoviceS = 0.6;
    /// <summary>Fall hazard per second per unit of heeling moment beyond <see cref="OverpowerFallFrom"/>, at skill 0 (model value).</summary>
    public const double OverpowerHazardPerS = 2.0;
    /// <summary>
    /// Heel use (held heeling moment over the rider's steady limit) from which an overpowered rider may fall (model
    /// value). The steady limit is what a rider holds for minutes, hanging from the harness; for a second or two they
    /// take more by dropping their weight lower and further out and by easing the sheet a little, so the rider's own
    /// sheeting lag in a gusty breeze (a few per cent over) is no fall: a catapult takes a gust well past the limit.
    /// </summary>
    public const double OverpowerFallFrom = 1.10;
    /// <summary>Time constant of the rider's reading of the wind, s (smooths gusts: from memory, riders judge shifts over a few seconds).</summary>
    public const double PerceptionLagS = 3.0;
    /// <summary>Share of W' the rider keeps in hand: pumping stops below it (model value).</summary>
    public const double ReserveFloor = 0.15;
    /// <summary>Share of W' a rider who ran down to the floor recovers before pumping again (model value).</summary>
    public const double RestUntil = 0.6;

    /// <summary>Time from a decision to acting on it, s, at skill 1 and 0 (from memory: choice reaction times of 0.4-0.8 s).</summary>
    public const double ReactionExpertS = 0.4, ReactionNoviceS = 0.8;
    /// <summary>Time constant of the rider's error in reading the wind, s (model value: a misreading persists for a while).</summary>
    public const double ReadingErrorTauS = 10;
    /// <summary>Standard deviation of the rider's reading of the wind direction, deg, at skill 1 and 0 (model values).</summary>
    public const double ReadingErrorExpertDeg = 1, ReadingErrorNoviceDeg = 3;
    /// <summary>Standard deviation of the rider's reading of the wind speed, share, at skill 1 and 0 (model values).</summary>
    public const double ReadingErrorExpertShare = 0.03, ReadingErrorNoviceShare = 0.08;

    public static double Lerp(double expert, double novice, double skill) => novice + (expert - novice) * Math.Clamp(skill, 0, 1);
}
