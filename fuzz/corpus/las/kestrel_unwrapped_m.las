~VERSION INFORMATION
 VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.   NO : ONE LINE PER DEPTH STEP
#--------------------------------------------
~WELL INFORMATION
#MNEM.UNIT    DATA              : DESCRIPTION
 STRT.M     0.000            : START DEPTH
 STOP.M     10.000            : STOP DEPTH
 STEP.M     0.500            : STEP
 NULL.      -999.25           : NULL VALUE
 WELL.      Kestrel Bluff hand-held log  : SECTION NAME
 LOC .      Invented outcrop, Marrow Basin  : LOCATION
 DATE.      2026-08-14        : LOG DATE
~CURVE INFORMATION
 DEPT.M                 : DEPTH BELOW SECTION TOP
 GR  .API                 : TOTAL GAMMA RAY
 K   .%                   : POTASSIUM
~PARAMETER INFORMATION
 GAIN.      1.00 : DETECTOR GAIN
~OTHER
Readings every 0.5 m with a hand-held spectrometer, 120 s count.
~A  DEPTH     GR     K
    0.000    60.0000   2.0000
    0.500    71.4518   1.9751
    1.000    81.6429   1.9021
    1.500    89.4515   1.7854
    2.000  -999.2500   1.6322
    2.500  -999.2500   1.4523
    3.000    91.8254   1.2566
    3.500    85.3080   1.0574
    4.000    76.0045   0.8671
    4.500    64.9392   0.6975
    5.000    53.3301   0.5591
    5.500    42.4553 -999.2500
    6.000    33.5119   0.4080
    6.500    27.4845   0.4047
    7.000    25.0366   0.4508
    7.500    26.4377   0.5436
    8.000    31.5335   0.6771
    8.500    39.7631   0.8431
    9.000    50.2205   1.0314
    9.500    61.7544   1.2301
   10.000    73.0953   1.4269
