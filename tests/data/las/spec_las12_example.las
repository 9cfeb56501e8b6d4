~VERSION INFORMATION
 VERS.                  1.2:   CWLS LOG ASCII STANDARD -VERSION 1.2
 WRAP.                  NO:   ONE LINE PER DEPTH STEP
~WELL INFORMATION BLOCK
#MNEM.UNIT       DATA TYPE    INFORMATION
#---------    -------------   ------------------------------
 STRT.M        1670.000000:
 STOP.M        1669.750000:
 STEP.M            -0.1250:
 NULL.           -999.2500:
 COMP.             COMPANY:   # ANY OIL COMPANY LTD.
 WELL.                WELL:   ANY ET AL OIL WELL #12
 FLD .               FIELD:   EDAM
 LOC .            LOCATION:   A9-16-49-20W3M
 PROV.            PROVINCE:   SASKATCHEWAN
 SRVC.     SERVICE COMPANY:   ANY LOGGING COMPANY LTD.
 DATE.            LOG DATE:   25-DEC-1988
 UWI .      UNIQUE WELL ID:   100091604920W300
~CURVE INFORMATION
#MNEM.UNIT      API CODE      CURVE DESCRIPTION
#---------    -------------   ------------------------------
 DEPT.M                      :   1  DEPTH
 DT  .US/M     60 520 32 00  :   2  SONIC TRANSIT TIME
 RHOB.K/M3     45 350 01 00  :   3  BULK DENSITY
 NPHI.V/V      42 890 00 00  :   4  NEUTRON POROSITY
 SFLU.OHMM     07 220 04 00  :   5  SHALLOW RESISTIVITY
 SFLA.OHMM     07 222 01 00  :   6  SHALLOW RESISTIVITY
 ILM .OHMM     07 120 44 00  :   7  MEDIUM RESISTIVITY
 ILD .OHMM     07 120 46 00  :   8  DEEP RESISTIVITY
~PARAMETER INFORMATION
#MNEM.UNIT        VALUE       DESCRIPTION
#---------    -------------   ------------------------------
 MUD .               GEL CHEM:   MUD TYPE
 BHT .DEGC            35.5000:   BOTTOM HOLE TEMPERATURE
 BS  .MM             200.0000:   BIT SIZE
 FD  .K/M3          1000.0000:   FLUID DENSITY
 MATR.                  SAND:   NEUTRON MATRIX
 MDEN.              2710.0000:   LOGGING MATRIX DENSITY
 RMF .OHMM             0.2160:   MUD FILTRATE RESISTIVITY
 DFD .K/M3          1525.0000:   DRILL FLUID DENSITY
~Other
     Note: The logging tools became stuck at 625 meters causing the data
     between 625 meters and 615 meters to be invalid.
~A  DEPTH     DT    RHOB     NPHI     SFLU     SFLA      ILM      ILD
1670.000   123.450 2550.000    0.450  123.450  123.450  110.200  105.600
1669.875   123.450 2550.000    0.450  123.450  123.450  110.200  105.600
1669.750   123.450 2550.000    0.450  123.450  123.450  110.200  105.600
