~Version
VERS.  3.0 : CWLS LAS 3.0
WRAP.  NO  :
DLM .  COMMA :
~Well
STRT.M 1000.0 :
STOP.M 1000.5 :
STEP.M 0.5 :
NULL.  -999.25 :
WELL.  INVENTED-4 :
~Log_Definition
DEPT.M : depth {F}
GR  .GAPI : gamma ray {F}
LITH. : lithology {S}
WAVE[1].US : array {AF;0us}
WAVE[2].US : array {AF;10us}
~Log_Data | Log_Definition
1000.0, 45.0 ,"SHALE, SILTY",0.1,0.2
1000.5,,SAND,-999.25,0.3
~Core_Definition
CTOP.M : top {F}
CDES. : description {S}
~Core_Data | Core_Definition
1000.0,"Long, broken"
