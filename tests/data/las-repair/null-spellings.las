# values written as null spellings of other programs
~VERSION INFORMATION
 VERS.                  2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.                   NO : ONE LINE PER DEPTH STEP
~WELL INFORMATION
 STRT.M         1500.0000                : START DEPTH
 STOP.M         1501.0000                : STOP DEPTH
 STEP.M         0.5000                   : STEP
 NULL.          -999.25                  : NULL VALUE
 WELL.          FIXTURE 1                : WELL
~CURVE INFORMATION
 DEPT.M                                  : MEASURED DEPTH
 GR  .GAPI                               : GAMMA RAY
 RHOB.G/C3                               : BULK DENSITY
~A
 1500.0   -1.#IND0000   2.3500
 1500.5   88.10   ERR
 1501.0   (null)   --
