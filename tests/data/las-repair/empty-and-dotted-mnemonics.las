# a curve line with an empty mnemonic and one with a leading dot
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
  .GAPI                                  : GAMMA RAY
 .RHOB.G/C3                              : BULK DENSITY
~A
 1500.0   35.20    2.3500
 1500.5   88.10    2.3400
 1501.0   41.70    2.3300
