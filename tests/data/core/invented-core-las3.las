# Invented LAS 3.0 file with a core analysis data set (no real well)
~Version
VERS.   3.0   : CWLS LOG ASCII STANDARD - VERSION 3.0
WRAP.   NO    : ONE LINE PER DEPTH STEP
DLM .   COMMA : DELIMITER
~Well
STRT.FT 6000.0 :
STOP.FT 6001.0 :
STEP.FT 0.5    :
NULL.   -999.25 :
WELL.   Ossel-9 : invented well
~Log_Definition
DEPT.FT : depth {F}
GR  .GAPI : gamma ray {F}
~Log_Data | Log_Definition
6000.0, 40.0
6000.5, 42.0
6001.0, 44.0
~Core_Definition
DEPT.FT : plug depth {F}
POROSITY_PCT.% : helium porosity {F}
PERM_MD.MD : horizontal air permeability {F}
SAMPLE_TYPE. : plug type {S}
~Core_Data | Core_Definition
6000.25, 21.5, 350.0, "plug, horizontal"
6000.75, 18.0, 0.0, plug
6001.10, 12.0, 4.2,
