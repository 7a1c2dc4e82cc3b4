# the depth curve is not first in ~C
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
 GR  .GAPI                               : GAMMA RAY
 DEPT.M                                  : MEASURED DEPTH
 RHOB.G/C3                               : BULK DENSITY
~A
 35.2 1500.0 2.35
 88.1 1500.5 2.52
 41.7 1501.0 2.33
