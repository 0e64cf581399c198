using CourseSim.Fin;
using CourseSim.Hull;
using CourseSim.Rider;
using CourseSim.Sail;
using CourseSim.Settings;

namespace CourseSim.Equilibrium;

/// <summary>Equipment files: one TOML file per set-up, keys carrying their units (docs/equipment.md).</summary>
public static class EquipmentFile
{
    public static readonly SettingsSchema Schema = new("equipment",
    [
        KeySpec.Text("name", "", "a label for this set-up"),
        KeySpec.Text("rider.name", "", "the rider's name"),
        KeySpec.Number("rider.mass_kg", 35, 130, 75, "rider mass, kg"),
        KeySpec.Number("rider.lever_m", 0.4, 1.8, 1.25, "largest offset of the rider's centre of mass from the mast foot, m"),
        KeySpec.Number("rider.critical_power_w", 50, 500, 220, "sustainable pumping power, W"),
        KeySpec.Number("rider.reserve_kj", 1, 40, 15, "work capacity above critical power (W'), kJ"),
        KeySpec.Number("rider.pump_efficiency", 0.05, 0.8, 0.4, "share of pumping power that becomes thrust"),
        KeySpec.Number("rider.drag_area_m2", 0.1, 1.2, 0.45, "rider frontal drag area, m2"),
        KeySpec.Number("rider.skill", 0, 1, 0.7, "skill, 0 novice .. 1 expert"),
        KeySpec.Text("sail.name", "", "the sail's model name"),
        KeySpec.Number("sail.area_m2", 2, 13, 7.0, "sail area, m2"),
        KeySpec.Derived("sail.luff_m", 2.5, 6.0, "luff length, m (default from area)"),
        KeySpec.Number("sail.outhaul", 0, 1, 0.5, "outhaul, 0 loosest .. 1 tightest"),
        KeySpec.Number("sail.depth_loose", 0.06, 0.22, 0.15, "profile depth f/c with outhaul eased"),
        KeySpec.Number("sail.depth_tight", 0.03, 0.15, 0.07, "profile depth f/c with outhaul on"),
        KeySpec.Number("sail.foot_closure", 0, 1, 0.6, "gap closed between foot and deck, 0 open .. 1 sealed"),
        KeySpec.Derived("sail.rig_mass_kg", 1, 20, "rig mass with mast and boom, kg (default from area)"),
        KeySpec.Number("fin.area_cm2", 100, 1200, 450, "fin area, cm2"),
        KeySpec.Number("fin.depth_cm", 10, 80, 42, "fin depth, cm"),
        KeySpec.Number("fin.max_lift", 0.4, 1.4, 0.9, "fin lift coefficient at spin-out"),
        KeySpec.Number("board.length_m", 1.8, 4.2, 2.40, "board length, m"),
        KeySpec.Number("board.width_cm", 45, 110, 75, "board width, cm"),
        KeySpec.Number("board.volume_l", 40, 300, 120, "board volume, litres"),
        KeySpec.Number("board.mass_kg", 3, 25, 8, "board mass, kg"),
        KeySpec.Number("conditions.air_temp_c", -10, 45, 15, "air temperature, C"),
        KeySpec.Number("conditions.water_temp_c", 0, 35, 15, "water temperature, C"),
        KeySpec.Number("conditions.salinity_g_per_kg", 0, 42, 35.16504, "salinity, g/kg (0 for fresh water)"),
        KeySpec.Number("conditions.chop_drag_area_cm2", 0, 60, ConditionsSpec.DefaultChopDragAreaCm2, "spray and chop drag area of the planing board, cm2 (0 flat water)"),
    ]);

    public static Equipment Load(string path, IEnumerable<string>? overrides = null)
        => FromSettings(SettingsFile.Load(path, Schema, overrides), Path.GetFileNameWithoutExtension(path));

    public static Equipment FromSettings(SettingsFile f, string fallbackName)
    {
        double depthLoose = f.Number("sail.depth_loose"), depthTight = f.Number("sail.depth_tight");
        if (depthTight >= depthLoose)
            throw f.ErrorAt("sail.depth_tight", $"must be less than sail.depth_loose ({depthLoose}): the outhaul flattens the sail");
        var eq = new Equipment
        {
            Name = f.Text("name") is { Length: > 0 } n ? n : fallbackName,
            Rider = new RiderSpec
            {
                MassKg = f.Number("rider.mass_kg"), LeverM = f.Number("rider.lever_m"),
                CriticalPowerW = f.Number("rider.critical_power_w"), ReserveKj = f.Number("rider.reserve_kj"),
                PumpEfficiency = f.Number("rider.pump_efficiency"), DragAreaM2 = f.Number("rider.drag_area_m2"), Skill = f.Number("rider.skill"),
            },
            Sail = new SailSpec
            {
                AreaM2 = f.Number("sail.area_m2"), LuffM = f.Number("sail.luff_m"), Outhaul = f.Number("sail.outhaul"),
                DepthLoose = depthLoose, DepthTight = depthTight, FootClosure = f.Number("sail.foot_closure"),
            },
            RigMassKg = f.Number("sail.rig_mass_kg"),
            Fin = new FinSpec { AreaCm2 = f.Number("fin.area_cm2"), DepthCm = f.Number("fin.depth_cm"), MaxLift = f.Number("fin.max_lift") },
            Board = new BoardSpec
            {
                LengthM = f.Number("board.length_m"), WidthCm = f.Number("board.width_cm"),
                VolumeL = f.Number("board.volume_l"), MassKg = f.Number("board.mass_kg"),
            },
            Conditions = new ConditionsSpec
            {
                AirTemperatureC = f.Number("conditions.air_temp_c"), WaterTemperatureC = f.Number("conditions.water_temp_c"),
                SalinityGPerKg = f.Number("conditions.salinity_g_per_kg"), ChopDragAreaCm2 = f.Number("conditions.chop_drag_area_cm2"),
            },
        };
        double volumeNeeded = eq.TotalMassKg / 1.0; // litres of fresh water the set-up displaces
        if (eq.Board.VolumeL < volumeNeeded * 0.6)
            throw f.ErrorAt("board.volume_l", $"{eq.Board.VolumeL} l is far too little to float {eq.TotalMassKg:F0} kg of rider and gear (a board sinks below about 0.6 l per kg)");
        return eq;
    }
}
