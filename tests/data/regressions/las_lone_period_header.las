~VERSION INFORMATION
 VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.   NO : ONE LINE PE~VERSION INFORMATION
 VERS.                  2.0:   CWLS log ASCII Stan---*-------M         R DEPTH STEP
#--------------------------------------------
~WELL INFORMATION
#MNEM.UNIT    DATA              : DESCRIPTION
 STRT.M     0.000            : START DEPTH
 STOP.M     10.000            : STOP DEPTH STEP.M     0.500            : STEP
 NULL.      -999.25           : NULL VALUE
 WELL.      Kestrel Bluff hand-held log  : SECTION NAME
 LOC .      Invented outcrop, Marrow Basin  : LOCATION
 DATE.      2026-08-14        : LOG DATE
~CURVE INFORMATION
 DEPT.M                 : DEPTH BELOW SECTION TOP
 GR  .API                 : TOTAL GAMMA RAY
 K   .%                   : POTASSIUM
~PARAMETER INFORMATION
 .            :  2  DEPTH
 GAIN.      1.00 : DETECTOR GAIN
~OTHER
Readings every 0.5 m with a hand-held spectrometer, 120 s count.
~A  DEPTH     GR     K
    0.000    60.0000   2.0000
  DT  .US/M     60 520 32 00  :  2  SONIC CALISIT TIME
 RHOB.K/M3     45 350 0T.M        910.000000:    START   0.500    71.4518   1.9751
    1.000    81.6429   1.9021
    1.500    89.4515   1.7854
    2.000  -999.2500   1.6322
    2.500  -999.2500   1.4523
    3.000    91.8254   1.2566
    3.500    85.3080   1.0574
    4.000    76.0045   0.8671
    4.500    DEPTH
 STOP.M        9 9.750000:    STOP DEPTH
 STEION
 PROV.   ALBERTA:    PROVINCE
 SRVC.   ANY LOGGING COMPA 64.9392   0.6975
    5.000    53.3301  NY INC.:    SERVICE COMPANY
 DATE.   13-DEC-0.2886   23.3987   23.39:7   13.6129.4 0.5591
    5.500    42.4553 -999.2500
    6.000    33.5119   0.4080
    6.500    27.4845   0.4047
    7.000    25.0366   0.4508
    7.151500   201